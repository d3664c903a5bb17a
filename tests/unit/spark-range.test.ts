// The tank tile's sparkline range: fitted to the data with a minimum span, band edges close by in view.
import { describe, expect, it } from "vitest";
import { SPARK_MIN_SPAN, sparkRange } from "@/lib/display/spark-range";

describe("sparkRange", () => {
  it("fits a slow drift so it fills most of the height, not a sliver of the band", () => {
    // pH drifting 5.95 → 6.10 inside a 5.5–6.5 band.
    const [lo, hi] = sparkRange({ min: [5.95, 6.0, 6.05], max: [5.97, 6.05, 6.1], band: [5.5, 6.5], minSpan: SPARK_MIN_SPAN.ph });
    expect(lo).toBeCloseTo(5.95 - 0.15 * 0.12, 9);
    expect(hi).toBeCloseTo(6.1 + 0.15 * 0.12, 9);
    expect((6.1 - 5.95) / (hi - lo)).toBeGreaterThan(0.8);
  });

  it("keeps a minimum span so noise on a steady value stays flat", () => {
    const [lo, hi] = sparkRange({ min: [6.0, 6.001], max: [6.002, 6.003], band: [5.5, 6.5], minSpan: 0.1 });
    expect(hi - lo).toBeCloseTo(0.1 * 1.24, 9);
    expect((lo + hi) / 2).toBeCloseTo(6.0015, 9);
  });

  it("brings a band edge within one span into view, but not a far one", () => {
    const [lo, hi] = sparkRange({ min: [6.3], max: [6.4], band: [5.5, 6.5], minSpan: 0.1 });
    expect(hi).toBeGreaterThan(6.5);
    expect(lo).toBeGreaterThan(6.2);
  });

  it("shows the band when there is no data yet", () => {
    expect(sparkRange({ min: [], max: [], band: [18, 22], minSpan: 0.5 })).toEqual([18 - 0.48, 22 + 0.48]);
  });
});
