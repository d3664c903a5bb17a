import { describe, expect, it } from "vitest";
import { fitEcStability, parseStandardText, runProgress, standardLabel } from "@/lib/calibration";

describe("runProgress", () => {
  const base = { plannedStandards: ["tech-7.00", "tech-4.01"], asFoundTaken: false, asFoundSkipped: false, cleaned: false, pointsTaken: 0 };

  it("checks a calibrated probe as found in the first buffer before cleaning", () => {
    const p = runProgress({ ...base, hasPreviousCalibration: true });
    expect(p.steps.map((s) => s.key)).toEqual(["as-found", "clean", "point", "point", "result"]);
    expect(p.steps[0].standard).toBe("tech-7.00");
    expect(p.current).toBe(0);
  });

  it("has no as-found check for a probe never calibrated", () => {
    expect(runProgress({ ...base, hasPreviousCalibration: false }).steps[0].key).toBe("clean");
  });

  it("resumes at the first step not done", () => {
    const p = runProgress({ ...base, hasPreviousCalibration: true, asFoundSkipped: true, cleaned: true, pointsTaken: 1 });
    expect(p.steps[p.current]).toEqual({ key: "point", index: 1, standard: "tech-4.01", done: false });
    const all = runProgress({ ...base, hasPreviousCalibration: true, asFoundTaken: true, cleaned: true, pointsTaken: 2 });
    expect(all.steps[all.current].key).toBe("result");
  });
});

describe("fitEcStability", () => {
  it("is stable when the conductance varies by less than 0.5 % over 30 s", () => {
    const samples = Array.from({ length: 31 }, (_, i) => ({ t: i * 1000, conductanceUs: 1400 + (i % 2) * 5 }));
    expect(fitEcStability(samples).stable).toBe(true);
    const drifting = samples.map((s, i) => ({ ...s, conductanceUs: 1400 + i * 1 }));
    expect(fitEcStability(drifting).stable).toBe(false);
  });

  it("is not stable before the samples cover the window", () => {
    expect(fitEcStability([{ t: 0, conductanceUs: 1400 }, { t: 10_000, conductanceUs: 1400 }]).stable).toBe(false);
  });
});

describe("stored standards", () => {
  it("reads ids and JSON tables back", () => {
    expect(parseStandardText("tech-7.00")).toBe("tech-7.00");
    expect(parseStandardText('{"ec25UsPerCm":2770,"alphaPerC":0.019}')).toEqual({ ec25UsPerCm: 2770, alphaPerC: 0.019 });
    expect(standardLabel('{"ec25UsPerCm":2770,"alphaPerC":0.019}')).toBe("EC standard 2.77 mS/cm at 25 °C");
    expect(standardLabel("kcl-0.01M")).toMatch(/1413/);
  });
});
