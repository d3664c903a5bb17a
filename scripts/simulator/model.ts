// Physical model shared by the seed (history) and the live simulator.
// Pure functions of time and a seed, so the same tank tells the same story everywhere.

export const DAY_MS = 86_400_000;

/** Mulberry32: a small deterministic PRNG. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Deterministic smooth noise in [-1, 1] from a seed and a time, via summed sines. */
export function smoothNoise(seed: number, tMs: number, periodMs: number): number {
  const r = rng(seed);
  let v = 0;
  for (let i = 1; i <= 3; i++) {
    const phase = r() * Math.PI * 2;
    v += Math.sin((2 * Math.PI * tMs) / (periodMs / i) + phase) / i;
  }
  return v / 1.83;
}

/** Solution temperature with a day/night cycle (warmest mid-afternoon local time). */
export function solutionTempC(seed: number, tMs: number, meanC = 20, swingC = 1.6): number {
  const dayPhase = ((tMs % DAY_MS) / DAY_MS) * 2 * Math.PI;
  return meanC + swingC * Math.sin(dayPhase - Math.PI * 0.75) + 0.25 * smoothNoise(seed, tMs, 3 * 3_600_000);
}

const LN10 = Math.log(10);
const R = 8.314462618;
const F = 96485.33212;
/** Ideal electrode slope, mV per pH unit (CODATA 2018 constants). */
export function nernstMv(tempC: number): number {
  return (LN10 * R * (tempC + 273.15) * 1000) / F;
}

/** The electrode itself: its true offset and slope drift slowly between cleanings. */
export interface Electrode {
  offsetMv: number; // true E0 at pH 7
  slopePct: number; // true slope, % of ideal
}

/** Millivolts a glass electrode gives in a solution of this pH at this temperature. */
export function electrodeMv(ph: number, tempC: number, e: Electrode): number {
  return e.offsetMv - (e.slopePct / 100) * nernstMv(tempC) * (ph - 7);
}

/** Conductance (µS) an EC cell of constant K (1/cm) gives for EC25 (mS/cm) at tempC. */
export function cellConductanceUs(ec25MsPerCm: number, tempC: number, cellConstant: number, alphaPerC: number): number {
  const kappaUsPerCm = ec25MsPerCm * 1000 * (1 + alphaPerC * (tempC - 25));
  return kappaUsPerCm / cellConstant;
}

/** Electrode condition drifting with days since its last cleaning (common practice figures). */
export function agedElectrode(base: Electrode, daysSinceCleaning: number): Electrode {
  return {
    offsetMv: base.offsetMv + 0.35 * daysSinceCleaning,
    slopePct: base.slopePct - 0.08 * daysSinceCleaning,
  };
}
