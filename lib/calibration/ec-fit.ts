import { ecStandardAt, requireAlpha, type EcStandardSpec } from "./ec-standards";
import { CalibrationInputError } from "./errors";
import { fmt, fmtAgainst, fmtTemp } from "./format";
import { requireFinite, requirePositive } from "./guards";
import type { Verdict } from "./ph-acceptance";

/** Cell constant acceptance: within ±10 % of nominal (common practice). */
export const EC_ACCEPTANCE = { maxDeviationPct: 10 } as const;

const EPS = 1e-9;

export interface EcFitInput {
  standard: EcStandardSpec;
  /** Conductance measured in the standard, µS. */
  conductanceUs: number;
  tempC: number;
  /** The probe's nominal cell constant, 1/cm. */
  nominalCellConstant: number;
}

export interface EcFit {
  /** Measured cell constant K = EC_std(t) / G, 1/cm. */
  cellConstant: number;
  /** (K − nominal) / nominal, in %. */
  deviationPct: number;
  verdict: Verdict;
  /** Why the fit was rejected; empty when accepted. */
  reasons: string[];
  /** EC of the standard at the measured temperature, µS/cm (for the record). */
  standardUsPerCm: number;
}

export interface EcCalibration {
  /** 1/cm. */
  cellConstant: number;
  /** Linear temperature coefficient of the solution, per °C (default in the app 0.019). */
  alphaPerC: number;
}

function fmtK(k: number): string {
  return `${Number(k.toPrecision(4))} /cm`;
}

/** One-point EC calibration: K = EC_std(t) / G, accepted within ±10 % of nominal. */
export function fitEc(input: EcFitInput): EcFit {
  const g = requireFinite(input.conductanceUs, "Conductance");
  if (g <= 0) {
    throw new CalibrationInputError(
      "non-positive-conductance",
      `Conductance ${g} µS in the standard is not possible; check the probe is in the standard and connected`,
    );
  }
  const t = requireFinite(input.tempC, "Temperature");
  const nominal = requirePositive(input.nominalCellConstant, "The nominal cell constant");
  const standardUsPerCm = ecStandardAt(input.standard, t);
  const cellConstant = standardUsPerCm / g;
  const deviationPct = ((cellConstant - nominal) / nominal) * 100;
  const limit = EC_ACCEPTANCE.maxDeviationPct;
  const reasons: string[] = [];
  if (Math.abs(deviationPct) > limit + EPS) {
    const d = fmtAgainst(Math.abs(deviationPct), limit);
    const base = `Cell constant ${fmtK(cellConstant)} is ${d} % ${deviationPct > 0 ? "above" : "below"} the nominal ${fmtK(nominal)} (limit ±${limit} %)`;
    reasons.push(
      deviationPct > 0
        ? `${base}: clean the probe, make sure no air bubbles cling to it, and retry in fresh standard`
        : `${base}: check the right standard is selected and that it is fresh and not contaminated, then retry`,
    );
  }
  return {
    cellConstant,
    deviationPct,
    verdict: reasons.length === 0 ? "accepted" : "rejected",
    reasons,
    standardUsPerCm,
  };
}

/**
 * EC compensated to 25 °C, µS/cm: EC25 = K·G / (1 + α(t − 25)). A conductance
 * of 0 (probe in air or pure water) gives 0; a negative one throws.
 */
export function ecFromConductance(
  conductanceUs: number,
  tempC: number,
  calibration: EcCalibration,
): number {
  const g = requireFinite(conductanceUs, "Conductance");
  if (g < 0) {
    throw new CalibrationInputError(
      "non-positive-conductance",
      `Conductance ${g} µS is negative; check the probe wiring`,
    );
  }
  const t = requireFinite(tempC, "Temperature");
  const k = requirePositive(calibration.cellConstant, "The cell constant");
  const alpha = requireAlpha(calibration.alphaPerC, "The temperature coefficient");
  const factor = 1 + alpha * (t - 25);
  if (factor <= 0) {
    throw new CalibrationInputError(
      "temperature-out-of-range",
      `Temperature ${fmtTemp(t)} is too far from 25 °C to compensate with a coefficient of ${fmt(alpha, 4)} per °C`,
    );
  }
  return (k * g) / factor;
}
