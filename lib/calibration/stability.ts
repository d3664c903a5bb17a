import { CalibrationInputError } from "./errors";
import { requireFinite, requirePositive } from "./guards";

/** Slack so a spread of exactly maxSpread in decimal (7.01 − 7.00) is not "less than" it. */
const EPS = 1e-9;

export interface PhSample {
  /** Time, ms. */
  t: number;
  ph: number;
}

export interface StabilityOptions {
  /** How long the reading must hold, ms (default 30 000). */
  windowMs?: number;
  /** The reading must vary by less than this, in pH (default 0.01). */
  maxSpread?: number;
}

export interface Stability {
  stable: boolean;
  /** max − min of the pH over the samples considered. */
  spread: number;
  /** How much of the window the samples cover, ms (at most windowMs). */
  coveredMs: number;
}

/**
 * Whether a buffer reading has settled: stable when the samples cover the
 * whole window ending at the latest sample and max − min < maxSpread.
 *
 * The samples considered are those inside the window plus the last one before
 * it (the reading held from that sample on), so sparse samples can still cover
 * the window. Samples may come in any order.
 */
export function fitPhStability(
  samples: readonly PhSample[],
  { windowMs = 30000, maxSpread = 0.01 }: StabilityOptions = {},
): Stability {
  const window = requirePositive(windowMs, "The stability window");
  const limit = requirePositive(maxSpread, "The stability spread");
  if (!Array.isArray(samples)) {
    throw new CalibrationInputError("invalid-parameter", "The stability samples must be a list");
  }
  const sorted = samples
    .map((s, i) => ({
      t: requireFinite(s.t, `Time of sample ${i + 1}`),
      ph: requireFinite(s.ph, `pH of sample ${i + 1}`),
    }))
    .sort((a, b) => a.t - b.t);
  const last = sorted[sorted.length - 1];
  if (last === undefined) return { stable: false, spread: 0, coveredMs: 0 };

  const start = last.t - window;
  let from = sorted.findIndex((s) => s.t >= start);
  if (from > 0 && sorted[from].t > start) from -= 1; // include the anchor before the window
  const considered = sorted.slice(from);

  let min = Infinity;
  let max = -Infinity;
  for (const s of considered) {
    if (s.ph < min) min = s.ph;
    if (s.ph > max) max = s.ph;
  }
  const spread = max - min;
  const coveredMs = Math.min(window, last.t - considered[0].t);
  return { stable: coveredMs >= window && spread < limit - EPS, spread, coveredMs };
}
