import { fitPhStability, type Stability } from "./stability";

export interface ConductanceSample {
  /** Time, ms. */
  t: number;
  conductanceUs: number;
}

export interface EcStabilityOptions {
  windowMs?: number;
  /** The conductance must vary by less than this share of the latest value, % (default 0.5). */
  maxSpreadPct?: number;
}

/**
 * Whether a conductance reading in a standard has settled: the same rule as
 * fitPhStability, with the spread taken relative to the latest value (Tidewell
 * choice: 0.5 % over 30 s). The returned spread is in %.
 */
export function fitEcStability(samples: readonly ConductanceSample[], { windowMs = 30000, maxSpreadPct = 0.5 }: EcStabilityOptions = {}): Stability {
  const latest = samples.reduce<ConductanceSample | null>((a, s) => (a === null || s.t > a.t ? s : a), null);
  if (latest === null || latest.conductanceUs <= 0) return { stable: false, spread: 0, coveredMs: 0 };
  const scaled = samples.map((s) => ({ t: s.t, ph: (s.conductanceUs / latest.conductanceUs) * 100 }));
  return fitPhStability(scaled, { windowMs, maxSpread: maxSpreadPct });
}
