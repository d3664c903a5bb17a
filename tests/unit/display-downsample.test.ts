// The chart downsampling (lib/display/downsample): bucket plans, min/max/mean folding and live append.
import { describe, expect, it } from "vitest";
import { appendReading, bucketPlan, emptyBuckets, foldIntoBuckets, samplesToPartials, type Partial } from "@/lib/display/downsample";

const S = 1000;
const M = 60 * S;
const DAY = 24 * 60 * M;

describe("bucketPlan", () => {
  it("picks the smallest readable width that keeps within the point budget", () => {
    expect(bucketPlan(0, 60 * M, 1000).bucketMs).toBe(5 * S); // 3.6 s wanted
    expect(bucketPlan(0, 60 * M, 3600).bucketMs).toBe(S);
    expect(bucketPlan(0, 30 * DAY, 2000).bucketMs).toBe(30 * M); // 21.6 min wanted
    expect(bucketPlan(0, 24 * 3_600_000, 1000).bucketMs).toBe(2 * M); // 86.4 s wanted
  });

  it("aligns the first bucket to a multiple of its width and never exceeds the budget", () => {
    for (const [from, to, points] of [
      [1_700_000_123_456, 1_700_000_123_456 + 30 * DAY, 2000],
      [1_700_000_000_001, 1_700_003_600_001, 10],
      [5 * S + 1, 65 * M + 7, 500],
    ] as const) {
      const plan = bucketPlan(from, to, points);
      expect(plan.start % plan.bucketMs).toBe(0);
      expect(plan.count).toBeLessThanOrEqual(points);
      expect(plan.start + plan.count * plan.bucketMs).toBeGreaterThanOrEqual(to);
    }
  });

  it("refuses an empty range", () => {
    expect(() => bucketPlan(10, 10, 100)).toThrow(RangeError);
  });
});

describe("foldIntoBuckets", () => {
  it("keeps the minimum and maximum of every bucket, so a spike survives downsampling", () => {
    const samples = Array.from({ length: 600 }, (_, i) => ({ ts: i * S, value: i === 123 ? 9.5 : 6 + (i % 10) / 100, quality: "ok" as const }));
    const b = foldIntoBuckets(samplesToPartials(samples), bucketPlan(0, 600 * S, 10));
    expect(b.t).toHaveLength(10);
    expect(b.bucketMs).toBe(M);
    expect(b.max[2]).toBe(9.5); // 123 s falls in the third minute
    expect(Math.max(...b.max.filter((_, i) => i !== 2))).toBeCloseTo(6.09);
    expect(Math.min(...b.min)).toBe(6);
    expect(b.count.reduce((a, n) => a + n, 0)).toBe(600);
  });

  it("merges partial summaries (per-minute rollups) by sum and count, not by averaging averages", () => {
    const partials: Partial[] = [
      { t: 0, min: 1, max: 3, sum: 60, count: 30 }, // mean 2 over 30 readings
      { t: M, min: 5, max: 5, sum: 50, count: 10 }, // mean 5 over 10 readings
    ];
    const b = foldIntoBuckets(partials, { start: 0, bucketMs: 2 * M, count: 1 });
    expect(b.mean[0]).toBeCloseTo(110 / 40);
    expect(b.min[0]).toBe(1);
    expect(b.max[0]).toBe(5);
    expect(b.quality[0]).toBeNull();
  });

  it("leaves empty buckets out, so the chart shows a gap instead of a line across missing data", () => {
    const b = foldIntoBuckets(samplesToPartials([{ ts: 0, value: 1 }, { ts: 5 * M, value: 2 }]), { start: 0, bucketMs: M, count: 10 });
    expect(b.t).toEqual([0, 5 * M]);
  });

  it("reports the worst quality flag of a bucket", () => {
    const b = foldIntoBuckets(
      samplesToPartials([
        { ts: 0, value: 6, quality: "ok" },
        { ts: S, value: 6, quality: "held" },
        { ts: 2 * S, value: 6, quality: "ok" },
        { ts: M, value: 6, quality: "lapsed" },
      ]),
      { start: 0, bucketMs: M, count: 2 },
    );
    expect(b.quality).toEqual(["held", "lapsed"]);
  });

  it("skips readings without a value and ones outside the plan", () => {
    const b = foldIntoBuckets(samplesToPartials([{ ts: 0, value: null }, { ts: -S, value: 4 }, { ts: 10 * M, value: 4 }, { ts: S, value: 7 }]), { start: 0, bucketMs: M, count: 10 });
    expect(b.mean).toEqual([7]);
  });
});

describe("appendReading", () => {
  it("folds a live reading into the last bucket or opens the next one", () => {
    let b = emptyBuckets(M);
    b = appendReading(b, { ts: 10 * S, value: 6 });
    b = appendReading(b, { ts: 20 * S, value: 8, quality: "suspect" });
    expect(b.t).toEqual([0]);
    expect([b.min[0], b.max[0], b.mean[0], b.count[0], b.quality[0]]).toEqual([6, 8, 7, 2, "suspect"]);
    b = appendReading(b, { ts: 70 * S, value: 5 });
    expect(b.t).toEqual([0, M]);
  });

  it("ignores a replayed reading older than the last bucket and drops buckets that left the window", () => {
    let b = emptyBuckets(M);
    for (let i = 0; i < 5; i++) b = appendReading(b, { ts: i * M, value: i });
    const before = b;
    expect(appendReading(b, { ts: 2 * M, value: 100 })).toBe(before);
    b = appendReading(b, { ts: 5 * M, value: 5 }, 3 * M);
    expect(b.t).toEqual([3 * M, 4 * M, 5 * M]);
    expect(before.t).toHaveLength(5); // the input is not changed
  });
});
