import { describe, expect, it } from "vitest";
import { countsOverTime, median, quantile, responseTimes, stackedTops } from "@/lib/alerts/stats";

const MIN = 60_000;
const DAY = 86_400_000;

describe("quantile (Hyndman and Fan 1996, definition 7; R quantile() type 7 and NumPy percentile() default)", () => {
  it("matches the published definition on small samples", () => {
    // numpy.percentile([1, 2, 3, 4], 90) = 3.7; R: quantile(1:4, 0.9) = 3.7
    expect(quantile([1, 2, 3, 4], 0.9)).toBeCloseTo(3.7, 12);
    // R: quantile(c(1, 3, 7, 15, 31), 0.9) = 24.6
    expect(quantile([31, 1, 15, 3, 7], 0.9)).toBeCloseTo(24.6, 12);
    expect(quantile([5], 0.9)).toBe(5);
    expect(quantile([2, 9], 0)).toBe(2);
    expect(quantile([2, 9], 1)).toBe(9);
  });

  it("median of an even count is the mean of the middle two; of none is null", () => {
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([7, 1, 3])).toBe(3);
    expect(median([])).toBeNull();
  });

  it("refuses a quantile outside 0–1", () => {
    expect(() => quantile([1], 1.5)).toThrow(RangeError);
  });
});

describe("responseTimes", () => {
  it("time to acknowledge counts acknowledged incidents only, time to resolve resolved ones", () => {
    const t = 1_000_000;
    const rows = [
      { openedAt: t, acknowledgedAt: t + 2 * MIN, resolvedAt: t + 20 * MIN },
      { openedAt: t, acknowledgedAt: t + 4 * MIN, resolvedAt: t + 40 * MIN },
      { openedAt: t, acknowledgedAt: t + 12 * MIN, resolvedAt: null },
      { openedAt: t, acknowledgedAt: null, resolvedAt: null },
    ];
    const r = responseTimes(rows);
    expect(r.acknowledge).toEqual({ count: 3, median: 4 * MIN, p90: 10.4 * MIN });
    expect(r.resolve).toEqual({ count: 2, median: 30 * MIN, p90: 38 * MIN });
    expect(responseTimes([]).acknowledge).toEqual({ count: 0, median: null, p90: null });
  });
});

describe("countsOverTime", () => {
  it("counts per key per bucket, biggest keys first, the rest summed", () => {
    const from = 10 * DAY;
    const rows = [
      { openedAt: from + 1, key: "out-of-band" },
      { openedAt: from + DAY + 5, key: "out-of-band" },
      { openedAt: from + DAY + 6, key: "out-of-band" },
      { openedAt: from + 2 * DAY, key: "stale" },
      { openedAt: from + 2 * DAY + 1, key: "flatline" },
      { openedAt: from + 3 * DAY, key: "stale" }, // outside [from, to)
    ];
    const c = countsOverTime(rows, { from, to: from + 3 * DAY, bucketMs: DAY, top: 1, otherKey: "other causes" });
    expect(c.starts).toEqual([from, from + DAY, from + 2 * DAY]);
    expect(c.series).toEqual([
      { key: "out-of-band", total: 3, counts: [1, 2, 0] },
      { key: "other causes", total: 2, counts: [0, 0, 2] },
    ]);
  });

  it("has every bucket even when nothing happened", () => {
    const c = countsOverTime([], { from: 0, to: 3 * DAY, bucketMs: DAY });
    expect(c).toEqual({ starts: [0, DAY, 2 * DAY], series: [] });
  });
});

describe("stackedTops", () => {
  it("stacks each series on the ones before it, per day; empty days draw no bar", () => {
    const data = {
      starts: [0, 1, 2],
      series: [
        { key: "stale", total: 3, counts: [2, 0, 1] },
        { key: "out-of-band", total: 2, counts: [1, 0, 1] },
        { key: "other", total: 1, counts: [0, 0, 1] },
      ],
    };
    expect(stackedTops(data)).toEqual([
      [2, null, 1],
      [3, null, 2],
      [3, null, 3],
    ]);
  });
});
