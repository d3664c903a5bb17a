import { bufferName, bufferPh, sameBuffer, type BufferSpec } from "./buffers";
import { CalibrationInputError } from "./errors";
import { fmt } from "./format";
import { requireFinite, requireSlopePct } from "./guards";
import { nernstSlopeMv } from "./nernst";
import { judgePhCalibration, type Verdict } from "./ph-acceptance";

/** One calibration point: the probe's mV in a buffer at a temperature. */
export interface PhPoint {
  buffer: BufferSpec;
  mv: number;
  tempC: number;
}

/** A pH calibration: slope in % of Nernstian, offset (E0, potential at pH 7) in mV. */
export interface PhCalibration {
  slopePct: number;
  offsetMv: number;
}

export interface PhFitOptions {
  /** The calibration being replaced; a one-point fit keeps its slope. */
  previous?: PhCalibration;
}

export interface PhFit extends PhCalibration {
  verdict: Verdict;
  /** Why the fit was rejected; empty when accepted. */
  reasons: string[];
  /** Things to do soon, present only when there are some. */
  advice?: string[];
  /** Three-point fits only: measured minus fitted mV, one per point, in input order. */
  residuals?: number[];
}

/** Slope assumed by a one-point fit when there is no previous calibration. */
export const DEFAULT_SLOPE_PCT = 100;

/**
 * Smallest pH spread between the buffers of a multi-point fit. Closer buffers
 * turn millivolts of noise into tens of percent of slope (Tidewell choice).
 */
export const MIN_BUFFER_SPREAD_PH = 1;

/** A one-point buffer further than this from pH 7 gets advice (Tidewell choice). */
const ONE_POINT_NEAR_7 = 0.5;

interface Prepared {
  ph: number;
  mv: number;
  k: number;
  /** k(t)·(pH − 7), the regressor: E = E0 − s·x. */
  x: number;
}

function prepare(points: readonly PhPoint[]): Prepared[] {
  return points.map((p, i) => {
    const n = points.length > 1 ? ` of point ${i + 1}` : "";
    if (typeof p !== "object" || p === null) {
      throw new CalibrationInputError("invalid-parameter", `Point ${i + 1} is not a calibration point`);
    }
    const mv = requireFinite(p.mv, `Millivolts${n}`);
    const tempC = requireFinite(p.tempC, `Temperature${n}`);
    const ph = bufferPh(p.buffer, tempC);
    const k = nernstSlopeMv(tempC);
    return { ph, mv, k, x: k * (ph - 7) };
  });
}

function checkDistinct(points: readonly PhPoint[], prepared: Prepared[]): void {
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) {
      if (sameBuffer(points[i].buffer, points[j].buffer)) {
        throw new CalibrationInputError(
          "duplicate-buffer",
          `Points ${i + 1} and ${j + 1} were both measured in ${bufferName(points[i].buffer)}; each point needs a different buffer, for example pH 7 then pH 4`,
        );
      }
    }
  }
  const phs = prepared.map((p) => p.ph);
  const spread = Math.max(...phs) - Math.min(...phs);
  if (spread < MIN_BUFFER_SPREAD_PH) {
    throw new CalibrationInputError(
      "buffers-too-close",
      `The buffers are only ${fmt(spread, 3)} pH apart; use buffers at least ${MIN_BUFFER_SPREAD_PH} pH apart, for example pH 7 and pH 4`,
    );
  }
}

function twoPoint([p1, p2]: Prepared[]): { s: number; e0: number } {
  // DOMAIN.md section 1: s = (E1 − E2) / (k(t2)(pH2 − 7) − k(t1)(pH1 − 7)).
  const s = (p1.mv - p2.mv) / (p2.x - p1.x);
  const e0 = p1.mv + s * p1.x;
  return { s, e0 };
}

function leastSquares(prepared: Prepared[]): { s: number; e0: number; residuals: number[] } {
  const n = prepared.length;
  const xMean = prepared.reduce((a, p) => a + p.x, 0) / n;
  const eMean = prepared.reduce((a, p) => a + p.mv, 0) / n;
  let sxx = 0;
  let sxe = 0;
  for (const p of prepared) {
    sxx += (p.x - xMean) ** 2;
    sxe += (p.x - xMean) * (p.mv - eMean);
  }
  // E = E0 − s·x, so the regression slope of E on x is −s.
  const s = -sxe / sxx;
  const e0 = eMean + s * xMean;
  const residuals = prepared.map((p) => p.mv - (e0 - s * p.x));
  return { s, e0, residuals };
}

/**
 * Fits a pH calibration from 1 to 3 points. One point adjusts the offset and
 * keeps the previous slope (100 % without one); two points use the exact
 * two-point formulas; three points fit slope and offset by least squares and
 * report the residuals in mV.
 */
export function fitPh(points: readonly PhPoint[], options: PhFitOptions = {}): PhFit {
  if (!Array.isArray(points) || points.length < 1 || points.length > 3) {
    const n = Array.isArray(points) ? points.length : 0;
    throw new CalibrationInputError(
      "point-count",
      `A pH calibration takes 1 to 3 points, got ${n}`,
    );
  }
  const prepared = prepare(points);
  const advice: string[] = [];
  let s: number;
  let e0: number;
  let residuals: number[] | undefined;

  if (prepared.length === 1) {
    const previous = options.previous;
    let slopePct = DEFAULT_SLOPE_PCT;
    if (previous !== undefined) {
      slopePct = requireSlopePct(previous.slopePct, "The previous slope");
      requireFinite(previous.offsetMv, "The previous offset");
    }
    s = slopePct / 100;
    e0 = prepared[0].mv + s * prepared[0].x;
    advice.push(
      previous !== undefined
        ? `One-point calibration: the slope was not measured, so the previous ${fmt(slopePct)} % was kept`
        : `One-point calibration with no previous calibration: the slope was not measured and ${fmt(slopePct)} % was assumed; do a two-point calibration soon`,
    );
    if (Math.abs(prepared[0].ph - 7) > ONE_POINT_NEAR_7) {
      advice.push(
        `A one-point calibration is most reliable in a pH 7 buffer; this one used pH ${fmt(prepared[0].ph, 2)}`,
      );
    }
  } else {
    checkDistinct(points, prepared);
    if (prepared.length === 2) {
      ({ s, e0 } = twoPoint(prepared));
    } else {
      ({ s, e0, residuals } = leastSquares(prepared));
    }
  }

  const slopePct = s * 100 + 0; // + 0 turns -0 into 0
  const offsetMv = e0 + 0;
  const judgement = judgePhCalibration(slopePct, offsetMv);
  advice.push(...judgement.advice);

  const fit: PhFit = { slopePct, offsetMv, verdict: judgement.verdict, reasons: judgement.reasons };
  if (advice.length > 0) fit.advice = advice;
  if (residuals !== undefined) fit.residuals = residuals;
  return fit;
}
