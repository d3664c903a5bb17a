// Figures of the incident history: time to acknowledge and to resolve (median, 90th
// percentile), and incident counts per cause or tank over time. Pure, synchronous.

/**
 * The p-quantile (0 ≤ p ≤ 1) by linear interpolation between closest ranks: definition 7 of
 * Hyndman and Fan (1996), the default of R's quantile() and NumPy's percentile(). `null` for
 * no values.
 */
export function quantile(values: readonly number[], p: number): number | null {
  if (!(p >= 0 && p <= 1)) throw new RangeError("The quantile must be between 0 and 1.");
  const xs = values.filter((v) => Number.isFinite(v)).sort((a, b) => a - b);
  if (xs.length === 0) return null;
  const h = (xs.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.ceil(h);
  return xs[lo] + (h - lo) * (xs[hi] - xs[lo]);
}

export function median(values: readonly number[]): number | null {
  return quantile(values, 0.5);
}

export interface Spread {
  /** How many incidents the figure is over. */
  count: number;
  median: number | null;
  p90: number | null;
}

export interface IncidentTimes {
  openedAt: number;
  acknowledgedAt: number | null;
  resolvedAt: number | null;
}

function spread(durations: number[]): Spread {
  return { count: durations.length, median: median(durations), p90: quantile(durations, 0.9) };
}

/** Time to acknowledge (over acknowledged incidents) and to resolve (over resolved ones), ms. */
export function responseTimes(rows: readonly IncidentTimes[]): { acknowledge: Spread; resolve: Spread } {
  const ack = rows.filter((r) => r.acknowledgedAt !== null).map((r) => (r.acknowledgedAt as number) - r.openedAt);
  const res = rows.filter((r) => r.resolvedAt !== null).map((r) => (r.resolvedAt as number) - r.openedAt);
  return { acknowledge: spread(ack), resolve: spread(res) };
}

export interface CountSeries {
  /** Bucket start times, ms epoch, every bucket from the first to the last. */
  starts: number[];
  series: { key: string; total: number; counts: number[] }[];
}

/**
 * Incidents per key (cause, tank) per time bucket over [from, to). The `top` keys with the most
 * incidents get their own series, largest first; the rest are summed as `otherKey`.
 */
export function countsOverTime(
  rows: readonly { openedAt: number; key: string }[],
  o: { from: number; to: number; bucketMs: number; top?: number; otherKey?: string },
): CountSeries {
  if (!(o.bucketMs > 0) || !(o.to > o.from)) throw new RangeError("Need a positive bucket and a range that ends after it starts.");
  const first = Math.floor(o.from / o.bucketMs) * o.bucketMs;
  const n = Math.ceil((o.to - first) / o.bucketMs);
  const starts = Array.from({ length: n }, (_, i) => first + i * o.bucketMs);
  const byKey = new Map<string, number[]>();
  for (const r of rows) {
    if (r.openedAt < o.from || r.openedAt >= o.to) continue;
    const counts = byKey.get(r.key) ?? new Array<number>(n).fill(0);
    counts[Math.floor((r.openedAt - first) / o.bucketMs)]++;
    byKey.set(r.key, counts);
  }
  const all = [...byKey].map(([key, counts]) => ({ key, counts, total: counts.reduce((a, b) => a + b, 0) }));
  all.sort((a, b) => b.total - a.total || a.key.localeCompare(b.key));
  const top = o.top ?? all.length;
  const series = all.slice(0, top);
  const rest = all.slice(top);
  if (rest.length) {
    const counts = new Array<number>(n).fill(0);
    for (const s of rest) s.counts.forEach((c, i) => (counts[i] += c));
    series.push({ key: o.otherKey ?? "other", counts, total: counts.reduce((a, b) => a + b, 0) });
  }
  return { starts, series };
}

/**
 * The top of each series' segment in a stacked bar per bucket: series 0 at the bottom, each next
 * series on top of the ones before (so the last row is the bucket's total). A bucket with nothing
 * in it is null for every series (no bar drawn).
 */
export function stackedTops(data: CountSeries): (number | null)[][] {
  const running = data.starts.map(() => 0);
  const totals = data.starts.map((_, j) => data.series.reduce((sum, s) => sum + s.counts[j], 0));
  return data.series.map((s) =>
    s.counts.map((c, j) => {
      running[j] += c;
      return totals[j] === 0 ? null : running[j];
    }),
  );
}
