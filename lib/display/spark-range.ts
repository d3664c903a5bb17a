// The y-range of a tank tile's sparkline: fitted to what the probe did, so a slow drift reads as a
// slope rather than a flat line inside a wide target band. A minimum span keeps sensor noise from
// being blown up into a trend; a band edge close to the data is brought into view, so a drift
// towards it shows its distance to the edge.

/** Smallest span a sparkline shows, per measure, in display units (our choice, not a standard). */
export const SPARK_MIN_SPAN = { ph: 0.1, ecMsPerCm: 0.05, temp: 0.5 } as const;

export function sparkRange(o: { min: number[]; max: number[]; band: [number, number]; minSpan: number }): [number, number] {
  const lows = o.min.filter(Number.isFinite);
  const highs = o.max.filter(Number.isFinite);
  let lo: number;
  let hi: number;
  if (lows.length === 0 || highs.length === 0) {
    [lo, hi] = o.band; // nothing yet: the band itself
  } else {
    lo = Math.min(...lows);
    hi = Math.max(...highs);
    const span = Math.max(hi - lo, o.minSpan);
    const mid = (lo + hi) / 2;
    [lo, hi] = [mid - span / 2, mid + span / 2];
    // A band edge within one span of the data is shown too.
    if (o.band[0] < lo && lo - o.band[0] <= span) lo = o.band[0];
    if (o.band[1] > hi && o.band[1] - hi <= span) hi = o.band[1];
  }
  const pad = (hi - lo) * 0.12 || o.minSpan / 2;
  return [lo - pad, hi + pad];
}
