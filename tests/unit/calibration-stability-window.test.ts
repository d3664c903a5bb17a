import { describe, expect, it } from "vitest";
import { CalibrationInputError, DEFAULT_STABILITY_WINDOW_MS, parseStabilityWindowMs } from "@/lib/calibration";

describe("stability window setting", () => {
  it("defaults to 30 s when unset (DOMAIN.md: common practice, < 0.01 pH over 30 s)", () => {
    expect(parseStabilityWindowMs(undefined)).toBe(DEFAULT_STABILITY_WINDOW_MS);
    expect(parseStabilityWindowMs("  ")).toBe(30_000);
  });
  it("takes a whole number of milliseconds between 1 s and 10 min", () => {
    expect(parseStabilityWindowMs("6000")).toBe(6000);
    expect(parseStabilityWindowMs("1000")).toBe(1000);
    expect(parseStabilityWindowMs("600000")).toBe(600_000);
  });
  it.each(["999", "600001", "6.5", "soon", "-30000"])("refuses %s with a clear error", (v) => {
    expect(() => parseStabilityWindowMs(v)).toThrow(CalibrationInputError);
    expect(() => parseStabilityWindowMs(v)).toThrow(/whole number of ms between 1000 and 600000/);
  });
});
