// Time-series downsampling for charts: a plan of equal time buckets over a range, and the fold of
// samples (or pre-aggregated partials such as per-minute rollups) into min, max and mean per bucket.
// Pure and synchronous; the series route and the live charts share it.

export type Quality = "ok" | "held" | "uncalibrated" | "lapsed" | "suspect";

/** Worse flags win when readings of different quality fall in one bucket. */
export const QUALITY_RANK: Record<Quality, number> = { ok: 0, held: 1, uncalibrated: 2, lapsed: 3, suspect: 4 };
const BY_RANK = (Object.keys(QUALITY_RANK) as Quality[]).sort((a, b) => QUALITY_RANK[a] - QUALITY_RANK[b]);

export function qualityOfRank(rank: number | null | undefined): Quality | null {
  return rank === null || rank === undefined ? null : (BY_RANK[rank] ?? null);
}

const S = 1000;
const M = 60 * S;
const H = 60 * M;
/** Bucket widths a person can read off an axis. */
export const NICE_BUCKETS_MS = [S, 2 * S, 5 * S, 10 * S, 15 * S, 30 * S, M, 2 * M, 5 * M, 10 * M, 15 * M, 30 * M, H, 2 * H, 3 * H, 6 * H, 12 * H, 24 * H];

export interface BucketPlan {
  /** Start of the first bucket, aligned to a multiple of bucketMs. */
  start: number;
  bucketMs: number;
  count: number;
}

/** Equal buckets covering [from, to), no more than `points` of them, each a nice width. */
export function bucketPlan(from: number, to: number, points: number): BucketPlan {
  if (!(to > from)) throw new RangeError("The range must end after it starts.");
  if (!(points >= 1)) throw new RangeError("At least one point is needed.");
  const wanted = (to - from) / points;
  let bucketMs = NICE_BUCKETS_MS.find((b) => b >= wanted);
  if (bucketMs === undefined) bucketMs = Math.ceil(wanted / (24 * H)) * 24 * H;
  let start = Math.floor(from / bucketMs) * bucketMs;
  let count = Math.ceil((to - start) / bucketMs);
  // Alignment can add one bucket at the front; drop the oldest rather than exceed the budget.
  if (count > points) {
    start += (count - points) * bucketMs;
    count = points;
  }
  return { start, bucketMs, count };
}

/** One sample, or a summary of several (a rollup row, a SQL group). */
export interface Partial {
  t: number;
  min: number;
  max: number;
  sum: number;
  count: number;
  /** Rank of the worst quality flag in it (QUALITY_RANK), when known. */
  worst?: number | null;
}

export interface Buckets {
  bucketMs: number;
  /** Bucket start times, ms epoch; only buckets that hold data. */
  t: number[];
  min: number[];
  max: number[];
  mean: number[];
  count: number[];
  /** Worst quality flag per bucket, null when the source does not carry flags. */
  quality: (Quality | null)[];
}

export function emptyBuckets(bucketMs: number): Buckets {
  return { bucketMs, t: [], min: [], max: [], mean: [], count: [], quality: [] };
}

/** Folds partials (any order) into the plan's buckets; partials outside the plan are ignored. */
export function foldIntoBuckets(partials: Iterable<Partial>, plan: BucketPlan): Buckets {
  const acc = new Map<number, { min: number; max: number; sum: number; count: number; worst: number | null }>();
  const end = plan.start + plan.count * plan.bucketMs;
  for (const p of partials) {
    if (p.count <= 0 || p.t < plan.start || p.t >= end || !Number.isFinite(p.min) || !Number.isFinite(p.max)) continue;
    const index = Math.floor((p.t - plan.start) / plan.bucketMs);
    const worst = p.worst ?? null;
    const cur = acc.get(index);
    if (!cur) acc.set(index, { min: p.min, max: p.max, sum: p.sum, count: p.count, worst });
    else {
      cur.min = Math.min(cur.min, p.min);
      cur.max = Math.max(cur.max, p.max);
      cur.sum += p.sum;
      cur.count += p.count;
      cur.worst = worst === null ? cur.worst : Math.max(cur.worst ?? 0, worst);
    }
  }
  const out = emptyBuckets(plan.bucketMs);
  for (const index of [...acc.keys()].sort((a, b) => a - b)) {
    const b = acc.get(index)!;
    out.t.push(plan.start + index * plan.bucketMs);
    out.min.push(b.min);
    out.max.push(b.max);
    out.mean.push(b.sum / b.count);
    out.count.push(b.count);
    out.quality.push(qualityOfRank(b.worst));
  }
  return out;
}

/** Raw samples as partials of one reading each (null values carry no number and are skipped). */
export function samplesToPartials(samples: Iterable<{ ts: number; value: number | null; quality?: Quality | null }>): Partial[] {
  const out: Partial[] = [];
  for (const s of samples) {
    if (s.value === null || !Number.isFinite(s.value)) continue;
    out.push({ t: s.ts, min: s.value, max: s.value, sum: s.value, count: 1, worst: s.quality ? QUALITY_RANK[s.quality] : null });
  }
  return out;
}

/**
 * Adds one live reading to downsampled data without refetching: into the last bucket when it
 * falls there, as a new bucket after it otherwise. Older readings than the last bucket are
 * ignored (they are already summarised). Buckets starting before `keepFrom` are dropped, so a
 * rolling window stays the same length. Returns a new object; the input is not changed.
 */
export function appendReading(b: Buckets, reading: { ts: number; value: number | null; quality?: Quality | null }, keepFrom?: number): Buckets {
  if (reading.value === null || !Number.isFinite(reading.value)) return b;
  const start = Math.floor(reading.ts / b.bucketMs) * b.bucketMs;
  const last = b.t.length - 1;
  const lastStart = last >= 0 ? b.t[last] : -Infinity;
  if (start < lastStart) return b;
  const rank = reading.quality ? QUALITY_RANK[reading.quality] : null;
  const next: Buckets = { bucketMs: b.bucketMs, t: [...b.t], min: [...b.min], max: [...b.max], mean: [...b.mean], count: [...b.count], quality: [...b.quality] };
  if (start === lastStart) {
    const n = next.count[last];
    next.min[last] = Math.min(next.min[last], reading.value);
    next.max[last] = Math.max(next.max[last], reading.value);
    next.mean[last] = (next.mean[last] * n + reading.value) / (n + 1);
    next.count[last] = n + 1;
    const prev = next.quality[last];
    if (rank !== null) next.quality[last] = prev === null || QUALITY_RANK[prev] < rank ? reading.quality! : prev;
  } else {
    next.t.push(start);
    next.min.push(reading.value);
    next.max.push(reading.value);
    next.mean.push(reading.value);
    next.count.push(1);
    next.quality.push(reading.quality ?? null);
  }
  if (keepFrom !== undefined) {
    const drop = next.t.findIndex((t) => t + b.bucketMs > keepFrom);
    const n = drop === -1 ? next.t.length : drop;
    if (n > 0) for (const key of ["t", "min", "max", "mean", "count", "quality"] as const) next[key].splice(0, n);
  }
  return next;
}
