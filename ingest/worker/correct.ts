// Turning one raw signal into a corrected value and a quality flag. Pure; shared by the live
// ingest and by recomputeFrom, so a recomputed reading is exactly what ingest would have stored.
import { calibrationStatus, CalibrationInputError, ecFromConductance, phFromMv } from "../../lib/calibration";
import { PHYSICAL_RANGES } from "../../lib/alerts/ranges";
import type { ProbeKind, QualityFlag } from "../../db/schema";
import type { CalibrationInForce } from "./calibrations";

/** Used for compensation when the tank has no temperature reading yet (the reference temperature). */
export const FALLBACK_TEMP_C = 25;

/** The ideal electrode, used for a pH probe that has never been calibrated. */
const IDEAL_PH = { slopePct: 100, offsetMv: 0 };

export interface CorrectionInput {
  kind: ProbeKind;
  raw: number;
  ts: number;
  /** Solution temperature at the sample's time (°C), or null when unknown. */
  tempC: number | null;
  calibration: CalibrationInForce | null;
  nominalCellConstant: number | null;
  alphaPerC: number;
  /** Calibration interval in days (tank's, capped by the site's maximum). */
  intervalDays: number;
  held: boolean;
}

export interface Correction {
  /** pH, EC25 in µS/cm, or °C; null when the signal cannot be corrected. */
  value: number | null;
  quality: QualityFlag;
  calibrationRunId: number | null;
}

/** Outside the physical sanity range (DOMAIN.md §4) a value is "suspect", not "out of band". */
export function isPhysical(kind: ProbeKind, value: number): boolean {
  const r = PHYSICAL_RANGES[kind];
  const v = kind === "ec" ? value / 1000 : value; // the range is in mS/cm, storage in µS/cm
  return v >= r.min && v <= r.max;
}

function corrected(input: CorrectionInput): number | null {
  const t = input.tempC ?? FALLBACK_TEMP_C;
  try {
    if (input.kind === "temp") return input.raw;
    if (input.kind === "ph") {
      const c = input.calibration;
      const params = c && c.slopePct !== null && c.offsetMv !== null ? { slopePct: c.slopePct, offsetMv: c.offsetMv } : IDEAL_PH;
      return phFromMv(input.raw, t, params);
    }
    const k = input.calibration?.cellConstant ?? input.nominalCellConstant ?? 1;
    return ecFromConductance(input.raw, t, { cellConstant: k, alphaPerC: input.alphaPerC });
  } catch (err) {
    // A negative conductance or an impossible temperature: stored as suspect, without a value.
    if (err instanceof CalibrationInputError) return null;
    throw err;
  }
}

/**
 * Quality, most telling first: held (maintenance: nothing else matters), suspect (physically
 * impossible), uncalibrated (no accepted calibration before the sample), lapsed (the calibration
 * in force is past its interval), ok. Temperature probes are not calibrated in Tidewell.
 */
export function correct(input: CorrectionInput): Correction {
  const value = corrected(input);
  const calibrationRunId = input.kind === "temp" ? null : (input.calibration?.id ?? null);
  let quality: QualityFlag;
  if (input.held) quality = "held";
  else if (value === null || !Number.isFinite(value) || !isPhysical(input.kind, value)) quality = "suspect";
  else if (input.kind === "temp") quality = "ok";
  else if (!input.calibration) quality = "uncalibrated";
  else if (
    calibrationStatus({ lastAcceptedAt: input.calibration.effectiveAt, intervalDays: Math.max(1, input.intervalDays), now: input.ts }) === "lapsed"
  )
    quality = "lapsed";
  else quality = "ok";
  return { value: value !== null && Number.isFinite(value) ? value : null, quality, calibrationRunId };
}
