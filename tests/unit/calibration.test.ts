import { describe, it, expect } from "vitest";
import {
  CalibrationInputError,
  DAY_MS,
  bufferPh,
  calibrationStatus,
  ecFromConductance,
  ecStandardAt,
  ecToCf,
  ecToPpm,
  fitEc,
  fitPh,
  fitPhStability,
  judgePhCalibration,
  nernstSlopeMv,
  phFromMv,
  suggestNextDue,
  type BufferSpec,
  type CalibrationErrorCode,
  type PhPoint,
} from "@/lib/calibration";

// Tolerances of the brief: pH ±0.002, mV ±0.05, EC ±0.1 %.
const PH_TOL = 0.002;
const MV_TOL = 0.05;
const EC_TOL_FRACTION = 0.001;

function expectNear(actual: number, expected: number, tol: number): void {
  expect(Number.isFinite(actual)).toBe(true);
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol);
}

function expectEc(actual: number, expected: number): void {
  expectNear(actual, expected, Math.abs(expected) * EC_TOL_FRACTION);
}

function expectCode(fn: () => unknown, code: CalibrationErrorCode): CalibrationInputError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(CalibrationInputError);
  expect(caught).toBeInstanceOf(Error);
  const err = caught as CalibrationInputError;
  expect(err.code).toBe(code);
  expect(err.name).toBe("CalibrationInputError");
  expect(err.message.length).toBeGreaterThan(10);
  expect(err.message).not.toMatch(/NaN|undefined/);
  return err;
}

/** Electrode model of DOMAIN.md section 1: E = E0 − s·k(t)·(pH − 7). */
function synthMv(ph: number, tempC: number, slopePct: number, offsetMv: number): number {
  return offsetMv - (slopePct / 100) * nernstSlopeMv(tempC) * (ph - 7);
}

function point(buffer: BufferSpec, tempC: number, slopePct: number, offsetMv: number): PhPoint {
  return { buffer, tempC, mv: synthMv(bufferPh(buffer, tempC), tempC, slopePct, offsetMv) };
}

/** Two points at 25 °C (pH 7.00 then 4.01) for a given slope and offset. */
function twoPointAt25(slopePct: number, offsetMv: number) {
  return fitPh([
    point("tech-7.00", 25, slopePct, offsetMv),
    point("tech-4.01", 25, slopePct, offsetMv),
  ]);
}

describe("nernstSlopeMv", () => {
  it("k(25 °C) = 59.159 mV/pH (CODATA 2018)", () => {
    expectNear(nernstSlopeMv(25), 59.159, MV_TOL);
    expectNear(nernstSlopeMv(25), 59.159, 0.0005);
  });
  it("k(0 °C) = 54.20 mV/pH (CODATA 2018)", () => {
    expectNear(nernstSlopeMv(0), 54.2, MV_TOL);
  });
  it("k(37 °C) = 61.54 mV/pH (CODATA 2018)", () => {
    expectNear(nernstSlopeMv(37), 61.54, MV_TOL);
  });
  it("is ln(10)·R·T/F with R = 8.314462618, F = 96485.33212, T = t + 273.15 (CODATA 2018)", () => {
    const k = (Math.LN10 * 8.314462618 * (18 + 273.15)) / 96485.33212 * 1000;
    expectNear(nernstSlopeMv(18), k, 1e-9);
  });
});

describe("bufferPh", () => {
  const hetzer = (tempC: number) => {
    const T = tempC + 273.15;
    return 2073.44 / T - 13.327 + 0.045199 * T - 3.4846e-5 * T * T;
  };

  it("phthalate 0.05 mol/kg is 4.005 at 25 °C (Hamer, Pinching and Acree, J. Res. NBS 36 (1946))", () => {
    expectNear(bufferPh("phthalate-0.05m", 25), 4.005, PH_TOL);
  });

  it("phthalate agrees with the 1977 fit within 0.003 from 0 to 50 °C (Hamer, Pinching and Acree, J. Res. NBS 36 (1946); Hetzer, Durst, Robinson and Bates, J. Res. NBS 81A (1977))", () => {
    for (let t = 0; t <= 50; t += 1) {
      expectNear(bufferPh("phthalate-0.05m", t), hetzer(t), 0.003);
    }
  });

  it("phthalate: the two fits differ by 0.003 on average over 0–60 °C but by up to 0.009 near 60 °C (Hamer, Pinching and Acree, J. Res. NBS 36 (1946); Hetzer, Durst, Robinson and Bates, J. Res. NBS 81A (1977))", () => {
    // DOMAIN.md says "agree within about 0.003"; Hetzer et al. report an average
    // difference of 0.003. Computed from the two published equations, the gap is
    // 0.0055 at 55 °C and 0.0088 at 60 °C, so only the average holds across 0–60 °C.
    let sum = 0;
    let n = 0;
    for (let t = 0; t <= 60; t += 1) {
      const d = Math.abs(bufferPh("phthalate-0.05m", t) - hetzer(t));
      expect(d).toBeLessThan(0.01);
      sum += d;
      n += 1;
    }
    expect(sum / n).toBeLessThanOrEqual(0.003);
  });

  it("phthalate covers 0–60 °C inclusive (Hamer, Pinching and Acree, J. Res. NBS 36 (1946))", () => {
    expect(Number.isFinite(bufferPh("phthalate-0.05m", 0))).toBe(true);
    expect(Number.isFinite(bufferPh("phthalate-0.05m", 60))).toBe(true);
    expectCode(() => bufferPh("phthalate-0.05m", 60.5), "temperature-out-of-range");
    expectCode(() => bufferPh("phthalate-0.05m", -1), "temperature-out-of-range");
  });

  it("phosphate 0.025 mol/kg is 6.865 at 25 °C (IUPAC 2002, Buck et al.)", () => {
    expectNear(bufferPh("phosphate-0.025m", 25), 6.865, PH_TOL);
  });

  it("phosphate table 10–40 °C, interpolated linearly (from memory)", () => {
    expectNear(bufferPh("phosphate-0.025m", 10), 6.923, PH_TOL);
    expectNear(bufferPh("phosphate-0.025m", 20), 6.881, PH_TOL);
    expectNear(bufferPh("phosphate-0.025m", 40), 6.838, PH_TOL);
    expectNear(bufferPh("phosphate-0.025m", 22.5), (6.881 + 6.865) / 2, PH_TOL);
  });

  it("borax 0.01 mol/kg is 9.180 at 25 °C (IUPAC 2002, Buck et al.)", () => {
    expectNear(bufferPh("borax-0.01m", 25), 9.18, PH_TOL);
  });

  it("borax away from 25 °C (from memory)", () => {
    expectNear(bufferPh("borax-0.01m", 10), 9.332, PH_TOL);
    expectNear(bufferPh("borax-0.01m", 40), 9.068, PH_TOL);
    expectNear(bufferPh("borax-0.01m", 27.5), (9.18 + 9.139) / 2, PH_TOL);
  });

  it("technical buffers follow their typical tables (from memory)", () => {
    expectNear(bufferPh("tech-7.00", 25), 7.0, PH_TOL);
    expectNear(bufferPh("tech-7.00", 10), 7.07, PH_TOL);
    expectNear(bufferPh("tech-7.00", 18), 7.028, PH_TOL);
    expectNear(bufferPh("tech-4.01", 25), 4.01, PH_TOL);
    expectNear(bufferPh("tech-4.01", 35), 4.02, PH_TOL);
    expectNear(bufferPh("tech-10.01", 25), 10.01, PH_TOL);
    expectNear(bufferPh("tech-10.01", 12.5), 10.15, PH_TOL);
    expectNear(bufferPh("tech-10.01", 35), 9.93, PH_TOL);
  });

  it("a user table from a certificate is sorted and interpolated linearly (from memory)", () => {
    const cert: BufferSpec = { points: [[30, 6.99], [20, 7.02], [25, 7.0]] };
    expectNear(bufferPh(cert, 22), 7.012, PH_TOL);
    expectNear(bufferPh(cert, 30), 6.99, PH_TOL);
    expectNear(bufferPh({ points: [[25, 6.86]] }, 25), 6.86, PH_TOL);
    expectCode(() => bufferPh({ points: [[25, 6.86]] }, 24), "temperature-out-of-range");
  });

  it("a temperature outside a table throws", () => {
    expectCode(() => bufferPh("tech-7.00", 9.9), "temperature-out-of-range");
    expectCode(() => bufferPh("tech-4.01", 36), "temperature-out-of-range");
    expectCode(() => bufferPh("phosphate-0.025m", 5), "temperature-out-of-range");
    expectCode(() => bufferPh("borax-0.01m", 41), "temperature-out-of-range");
    const err = expectCode(() => bufferPh("tech-7.00", 40), "temperature-out-of-range");
    expect(err.message).toContain("10 °C");
    expect(err.message).toContain("35 °C");
    expect(err.message).toContain("40 °C");
  });

  it("an unknown buffer id or a broken table throws", () => {
    expectCode(() => bufferPh("tech-6.86" as BufferSpec, 25), "unknown-buffer");
    expectCode(() => bufferPh({ points: [] }, 25), "invalid-table");
    expectCode(() => bufferPh({ points: [[20, 7], [20, 7.01]] }, 20), "invalid-table");
    expectCode(() => bufferPh({ points: [[20, 17]] }, 20), "invalid-table");
    expectCode(() => bufferPh({ points: [[20, Number.NaN]] }, 20), "non-finite");
    expectCode(() => bufferPh("tech-7.00", Number.NaN), "non-finite");
  });
});

describe("fitPh round trips (CODATA 2018 slope; tables from memory)", () => {
  const slopePct = 98.5;
  const offsetMv = -12;

  it("two points at 18 °C and 27 °C recover 98.5 % and −12 mV", () => {
    const fit = fitPh([
      point("tech-7.00", 18, slopePct, offsetMv),
      point("tech-4.01", 27, slopePct, offsetMv),
    ]);
    expectNear(fit.slopePct, slopePct, 1e-6);
    expectNear(fit.offsetMv, offsetMv, MV_TOL);
    expect(fit.verdict).toBe("accepted");
    expect(fit.reasons).toEqual([]);
    expect(fit.advice).toBeUndefined();
    expect(fit.residuals).toBeUndefined();
  });

  it("two points follow the exact formulas of DOMAIN.md section 1 (CODATA 2018; from memory)", () => {
    const p1 = { buffer: "tech-7.00" as const, mv: -10.3, tempC: 21 };
    const p2 = { buffer: "tech-10.01" as const, mv: -188.9, tempC: 23.5 };
    const ph1 = bufferPh(p1.buffer, p1.tempC);
    const ph2 = bufferPh(p2.buffer, p2.tempC);
    const k1 = nernstSlopeMv(p1.tempC);
    const k2 = nernstSlopeMv(p2.tempC);
    const s = (p1.mv - p2.mv) / (k2 * (ph2 - 7) - k1 * (ph1 - 7));
    const e0 = p1.mv + s * k1 * (ph1 - 7);
    const fit = fitPh([p1, p2]);
    expectNear(fit.slopePct, s * 100, 1e-9);
    expectNear(fit.offsetMv, e0, 1e-9);
  });

  it("the order of the two points does not matter", () => {
    const a = point("tech-7.00", 18, slopePct, offsetMv);
    const b = point("tech-4.01", 27, slopePct, offsetMv);
    const f1 = fitPh([a, b]);
    const f2 = fitPh([b, a]);
    expectNear(f1.slopePct, f2.slopePct, 1e-9);
    expectNear(f1.offsetMv, f2.offsetMv, 1e-9);
  });

  it("two points in primary buffers recover slope and offset (Hamer, Pinching and Acree, J. Res. NBS 36 (1946); IUPAC 2002, Buck et al.)", () => {
    const fit = fitPh([
      point("phosphate-0.025m", 27, slopePct, offsetMv),
      point("phthalate-0.05m", 18, slopePct, offsetMv),
    ]);
    expectNear(fit.slopePct, slopePct, 1e-6);
    expectNear(fit.offsetMv, offsetMv, MV_TOL);
  });

  it("three points at 18, 22 and 27 °C recover slope and offset with zero residuals", () => {
    const fit = fitPh([
      point("tech-7.00", 18, slopePct, offsetMv),
      point("tech-4.01", 22, slopePct, offsetMv),
      point("tech-10.01", 27, slopePct, offsetMv),
    ]);
    expectNear(fit.slopePct, slopePct, 1e-6);
    expectNear(fit.offsetMv, offsetMv, MV_TOL);
    expect(fit.residuals).toHaveLength(3);
    for (const r of fit.residuals ?? []) expectNear(r, 0, MV_TOL);
    expect(fit.verdict).toBe("accepted");
  });

  it("three points in primary buffers at 18 °C and 27 °C (IUPAC 2002, Buck et al.; Hamer, Pinching and Acree, J. Res. NBS 36 (1946))", () => {
    const fit = fitPh([
      point("phthalate-0.05m", 18, slopePct, offsetMv),
      point("phosphate-0.025m", 27, slopePct, offsetMv),
      point("borax-0.01m", 18, slopePct, offsetMv),
    ]);
    expectNear(fit.slopePct, slopePct, 1e-6);
    expectNear(fit.offsetMv, offsetMv, MV_TOL);
  });

  it("three points with one disturbed reading: residuals in mV satisfy the least-squares normal equations", () => {
    const pts = [
      point("tech-7.00", 18, slopePct, offsetMv),
      point("tech-4.01", 22, slopePct, offsetMv),
      point("tech-10.01", 27, slopePct, offsetMv),
    ];
    pts[1] = { ...pts[1], mv: pts[1].mv + 3 };
    const fit = fitPh(pts);
    const res = fit.residuals ?? [];
    expect(res).toHaveLength(3);
    const xs = pts.map((p) => nernstSlopeMv(p.tempC) * (bufferPh(p.buffer, p.tempC) - 7));
    expectNear(res.reduce((a, r) => a + r, 0), 0, 1e-9);
    expectNear(res.reduce((a, r, i) => a + r * xs[i], 0), 0, 1e-6);
    // Each residual is measured minus fitted mV.
    pts.forEach((p, i) => {
      const fitted = fit.offsetMv - (fit.slopePct / 100) * xs[i];
      expectNear(res[i], p.mv - fitted, 1e-9);
    });
    expect(Math.max(...res.map(Math.abs))).toBeGreaterThan(0.5);
  });

  it("phFromMv reads the sample back at several temperatures (CODATA 2018)", () => {
    const fit = fitPh([
      point("tech-7.00", 18, slopePct, offsetMv),
      point("tech-4.01", 27, slopePct, offsetMv),
    ]);
    for (const [ph, t] of [
      [5.8, 21],
      [6.2, 18],
      [5.5, 27],
      [7.4, 10],
      [4.0, 35],
    ] as const) {
      const mv = synthMv(ph, t, slopePct, offsetMv);
      expectNear(phFromMv(mv, t, fit), ph, PH_TOL);
    }
  });

  it("phFromMv is pH = 7 + (E0 − E)/(s·k(t)) (CODATA 2018)", () => {
    const cal = { slopePct: 97, offsetMv: 8 };
    expectNear(phFromMv(8, 25, cal), 7, 1e-12);
    const expected = 7 + (8 - 120) / (0.97 * nernstSlopeMv(25));
    expectNear(phFromMv(120, 25, cal), expected, 1e-12);
  });

  it("one point keeps the previous slope and adjusts the offset", () => {
    const fit = fitPh([point("tech-7.00", 18, slopePct, offsetMv)], {
      previous: { slopePct, offsetMv: 4 },
    });
    expect(fit.slopePct).toBe(slopePct);
    expectNear(fit.offsetMv, offsetMv, MV_TOL);
    expect(fit.verdict).toBe("accepted");
    expect(fit.advice?.join(" ")).toMatch(/slope was not measured/);
    expect(fit.residuals).toBeUndefined();
  });

  it("one point without a previous calibration assumes 100 %", () => {
    const fit = fitPh([point("tech-7.00", 22, 100, 5)]);
    expect(fit.slopePct).toBe(100);
    expectNear(fit.offsetMv, 5, MV_TOL);
    expect(fit.verdict).toBe("accepted");
  });

  it("one point far from pH 7 is advised against", () => {
    const fit = fitPh([point("tech-4.01", 22, 100, 5)]);
    expect(fit.advice?.join(" ")).toMatch(/most reliable in a pH 7 buffer/);
  });
});

describe("pH acceptance boundaries (common practice)", () => {
  it("slope exactly 90 % is accepted with the advice to clean the probe soon", () => {
    const fit = twoPointAt25(90, 0);
    expect(fit.verdict).toBe("accepted");
    expect(fit.reasons).toEqual([]);
    expect(fit.advice?.join(" ")).toMatch(/clean the probe soon/);
  });

  it("slope 89.9 % is rejected with a reason naming the value and the limit", () => {
    const fit = twoPointAt25(89.9, 0);
    expect(fit.verdict).toBe("rejected");
    expect(fit.reasons).toEqual(["Slope 89.9 % is below the 90 % minimum: clean the probe and retry"]);
  });

  it("the brief's example: slope 84.2 %", () => {
    const fit = twoPointAt25(84.2, 3);
    expect(fit.verdict).toBe("rejected");
    expect(fit.reasons).toContain("Slope 84.2 % is below the 90 % minimum: clean the probe and retry");
    expect(fit.advice?.join(" ")).toMatch(/rejected twice in a row is due for replacement/);
  });

  it("slope 94.9 % is accepted with advice; exactly 95 % needs no advice", () => {
    const a = twoPointAt25(94.9, 0);
    expect(a.verdict).toBe("accepted");
    expect(a.advice?.join(" ")).toMatch(/clean the probe soon/);
    const b = twoPointAt25(95, 0);
    expect(b.verdict).toBe("accepted");
    expect(b.advice).toBeUndefined();
  });

  it("slope exactly 105 % is accepted; 105.1 % is rejected", () => {
    expect(twoPointAt25(105, 0).verdict).toBe("accepted");
    const fit = twoPointAt25(105.1, 0);
    expect(fit.verdict).toBe("rejected");
    expect(fit.reasons[0]).toMatch(/^Slope 105\.1 % is above the 105 % maximum: /);
  });

  it("offset ±30 mV is accepted; ±30.1 mV is rejected with the value and the limit", () => {
    expect(twoPointAt25(100, 30).verdict).toBe("accepted");
    expect(twoPointAt25(100, -30).verdict).toBe("accepted");
    const hi = twoPointAt25(100, 30.1);
    expect(hi.verdict).toBe("rejected");
    expect(hi.reasons[0]).toMatch(/^Offset 30\.1 mV is outside the ±30 mV limit: /);
    const lo = twoPointAt25(100, -30.1);
    expect(lo.verdict).toBe("rejected");
    expect(lo.reasons[0]).toMatch(/^Offset -30\.1 mV is outside the ±30 mV limit: /);
  });

  it("slope and offset both out gives two reasons", () => {
    const fit = twoPointAt25(80, 45);
    expect(fit.verdict).toBe("rejected");
    expect(fit.reasons).toHaveLength(2);
  });

  it("a value just past a limit never reads as the limit itself", () => {
    const j = judgePhCalibration(89.96, 0);
    expect(j.verdict).toBe("rejected");
    expect(j.reasons[0]).toMatch(/^Slope 89\.96 % is below the 90 % minimum/);
  });

  it("a negative or zero fitted slope is rejected, not thrown", () => {
    const swapped = fitPh([
      point("tech-7.00", 25, -98, 0),
      point("tech-4.01", 25, -98, 0),
    ]);
    expect(swapped.verdict).toBe("rejected");
    expect(swapped.reasons[0]).toMatch(/^Slope -98\.0 % is below the 90 % minimum: /);
    const dead = fitPh([
      { buffer: "tech-7.00", mv: 12, tempC: 25 },
      { buffer: "tech-4.01", mv: 12, tempC: 25 },
    ]);
    expect(dead.slopePct).toBe(0);
    expect(dead.verdict).toBe("rejected");
  });
});

describe("EC standards", () => {
  const nist: [number, number][] = [
    [0, 772.92],
    [5, 890.96],
    [10, 1013.95],
    [15, 1141.45],
    [18, 1219.93],
    [20, 1273.03],
    [25, 1408.23],
    [30, 1546.63],
    [35, 1687.79],
    [40, 1831.27],
  ];

  it.each(nist)("0.01 mol/kg KCl at %d °C (NIST, Wu, Koch and Pratt 1991 / CRC Handbook)", (t, ec) => {
    expectEc(ecStandardAt("kcl-0.01m", t), ec);
  });

  it("0.01 mol/kg KCl is interpolated linearly between rows (NIST, Wu, Koch and Pratt 1991 / CRC Handbook)", () => {
    expectEc(ecStandardAt("kcl-0.01m", 22.5), (1273.03 + 1408.23) / 2);
    expectCode(() => ecStandardAt("kcl-0.01m", 40.1), "temperature-out-of-range");
    expectCode(() => ecStandardAt("kcl-0.01m", -0.1), "temperature-out-of-range");
  });

  it("0.1 mol/kg KCl is 12824.6 µS/cm at 25 °C (NIST, Wu, Koch and Pratt 1991 / CRC Handbook)", () => {
    expectEc(ecStandardAt("kcl-0.1m", 25), 12824.6);
  });

  it("0.1 mol/kg KCl away from 25 °C uses α 0.0191 (common practice)", () => {
    expectEc(ecStandardAt("kcl-0.1m", 20), 12824.6 * (1 - 0.0191 * 5));
    expectCode(() => ecStandardAt("kcl-0.1m", 45), "temperature-out-of-range");
  });

  it("0.01 mol/L KCl is 1413 µS/cm at 25 °C (OIML R 56)", () => {
    expectEc(ecStandardAt("kcl-0.01M", 25), 1413);
  });

  it("0.01 mol/L KCl table 15/20/25/30 °C, interpolated (common practice)", () => {
    expectEc(ecStandardAt("kcl-0.01M", 15), 1147);
    expectEc(ecStandardAt("kcl-0.01M", 20), 1278);
    expectEc(ecStandardAt("kcl-0.01M", 30), 1552);
    expectEc(ecStandardAt("kcl-0.01M", 27.5), (1413 + 1552) / 2);
    expectCode(() => ecStandardAt("kcl-0.01M", 14), "temperature-out-of-range");
    expectCode(() => ecStandardAt("kcl-0.01M", 31), "temperature-out-of-range");
  });

  it("a custom 2.77 mS/cm standard is kept at full value and compensated linearly (common practice)", () => {
    const std = { ec25UsPerCm: 2770, alphaPerC: 0.019 };
    expect(ecStandardAt(std, 25)).toBe(2770);
    expectEc(ecStandardAt(std, 20), 2770 * (1 + 0.019 * -5));
  });

  it("linear compensation of the NIST values at 15–35 °C with α 0.0188 lands within 1.5 % of the 25 °C value (NIST, Wu, Koch and Pratt 1991 / CRC Handbook)", () => {
    for (const [t, ec] of nist.filter(([t]) => t >= 15 && t <= 35)) {
      const ec25 = ecFromConductance(ec, t, { cellConstant: 1, alphaPerC: 0.0188 });
      expect(Math.abs(ec25 - 1408.23) / 1408.23).toBeLessThanOrEqual(0.015);
    }
  });

  it("unknown standards and bad custom standards throw", () => {
    expectCode(() => ecStandardAt("kcl-1m" as "kcl-0.01m", 25), "unknown-standard");
    expectCode(() => ecStandardAt({ ec25UsPerCm: 0, alphaPerC: 0.019 }, 25), "invalid-parameter");
    expectCode(() => ecStandardAt({ ec25UsPerCm: 1413, alphaPerC: -0.01 }, 25), "invalid-parameter");
    expectCode(() => ecStandardAt({ ec25UsPerCm: Number.NaN, alphaPerC: 0.019 }, 25), "non-finite");
    expectCode(() => ecStandardAt("kcl-0.01m", Number.POSITIVE_INFINITY), "non-finite");
  });
});

describe("fitEc and ecFromConductance", () => {
  it("K = EC_std(t)/G, accepted within ±10 % of nominal (common practice; NIST, Wu, Koch and Pratt 1991 / CRC Handbook)", () => {
    const fit = fitEc({ standard: "kcl-0.01m", conductanceUs: 1219.93 / 1.05, tempC: 18, nominalCellConstant: 1 });
    expectEc(fit.cellConstant, 1.05);
    expectNear(fit.deviationPct, 5, 1e-9);
    expect(fit.verdict).toBe("accepted");
    expect(fit.reasons).toEqual([]);
    expectEc(fit.standardUsPerCm, 1219.93);
  });

  it("exactly ±10 % is accepted; beyond is rejected with the value and the limit (common practice; OIML R 56)", () => {
    const at = (k: number) =>
      fitEc({ standard: "kcl-0.01M", conductanceUs: 1413 / k, tempC: 25, nominalCellConstant: 1 });
    expect(at(1.1).verdict).toBe("accepted");
    expect(at(0.9).verdict).toBe("accepted");
    const high = at(1.153);
    expect(high.verdict).toBe("rejected");
    expect(high.reasons[0]).toMatch(/^Cell constant 1\.153 \/cm is 15\.3 % above the nominal 1 \/cm \(limit ±10 %\): clean the probe/);
    const low = at(0.85);
    expect(low.verdict).toBe("rejected");
    expect(low.reasons[0]).toMatch(/15\.0 % below the nominal 1 \/cm \(limit ±10 %\)/);
  });

  it("a K = 0.1 probe in the custom 2.77 mS/cm standard (common practice)", () => {
    const fit = fitEc({
      standard: { ec25UsPerCm: 2770, alphaPerC: 0.019 },
      conductanceUs: (2770 * (1 + 0.019 * -3)) / 0.1,
      tempC: 22,
      nominalCellConstant: 0.1,
    });
    expectEc(fit.cellConstant, 0.1);
    expect(fit.verdict).toBe("accepted");
  });

  it("EC25 = K·G / (1 + α(t − 25)) (common practice)", () => {
    expectEc(ecFromConductance(1000, 25, { cellConstant: 1.02, alphaPerC: 0.019 }), 1020);
    expectEc(ecFromConductance(1000, 20, { cellConstant: 1.02, alphaPerC: 0.019 }), 1020 / 0.905);
    expect(ecFromConductance(0, 20, { cellConstant: 1, alphaPerC: 0.019 })).toBe(0);
  });

  it("round trip: calibrate in the NIST standard, then read it back as its 25 °C value within 1.5 % (NIST, Wu, Koch and Pratt 1991 / CRC Handbook)", () => {
    const trueK = 0.98;
    const fit = fitEc({ standard: "kcl-0.01m", conductanceUs: 1141.45 / trueK, tempC: 15, nominalCellConstant: 1 });
    const g = 1687.79 / trueK; // same standard at 35 °C
    const ec25 = ecFromConductance(g, 35, { cellConstant: fit.cellConstant, alphaPerC: 0.0188 });
    expect(Math.abs(ec25 - 1408.23) / 1408.23).toBeLessThanOrEqual(0.015);
  });

  it("zero or negative conductance, bad constants and non-finite numbers throw", () => {
    const base = { standard: "kcl-0.01m" as const, tempC: 25, nominalCellConstant: 1 };
    expectCode(() => fitEc({ ...base, conductanceUs: 0 }), "non-positive-conductance");
    expectCode(() => fitEc({ ...base, conductanceUs: -5 }), "non-positive-conductance");
    expectCode(() => fitEc({ ...base, conductanceUs: Number.NaN }), "non-finite");
    expectCode(() => fitEc({ ...base, conductanceUs: 1400, nominalCellConstant: 0 }), "invalid-parameter");
    expectCode(() => fitEc({ ...base, conductanceUs: 1400, tempC: 50 }), "temperature-out-of-range");
    const cal = { cellConstant: 1, alphaPerC: 0.019 };
    expectCode(() => ecFromConductance(-1, 25, cal), "non-positive-conductance");
    expectCode(() => ecFromConductance(Number.NaN, 25, cal), "non-finite");
    expectCode(() => ecFromConductance(100, 25, { cellConstant: 0, alphaPerC: 0.019 }), "invalid-parameter");
    expectCode(() => ecFromConductance(100, 25, { cellConstant: 1, alphaPerC: 0.5 }), "invalid-parameter");
    expectCode(() => ecFromConductance(100, -40, { cellConstant: 1, alphaPerC: 0.1 }), "temperature-out-of-range");
  });
});

describe("EC display conversions (common practice)", () => {
  it("ppm-500, ppm-700 and CF", () => {
    expect(ecToPpm(1.5, 500)).toBeCloseTo(750, 9);
    expect(ecToPpm(1.5, 700)).toBeCloseTo(1050, 9);
    expect(ecToPpm(2.77, 500)).toBeCloseTo(1385, 9);
    expect(ecToCf(1.5)).toBeCloseTo(15, 9);
    expect(ecToCf(2.77)).toBeCloseTo(27.7, 9);
  });
  it("an unknown scale or non-finite EC throws", () => {
    expectCode(() => ecToPpm(1.5, 640 as 500), "invalid-parameter");
    expectCode(() => ecToPpm(Number.NaN, 500), "non-finite");
    expectCode(() => ecToCf(Number.POSITIVE_INFINITY), "non-finite");
  });
});

describe("fitPh and phFromMv errors", () => {
  const p7 = { buffer: "tech-7.00" as const, mv: 0, tempC: 25 };
  const p4 = { buffer: "tech-4.01" as const, mv: 175, tempC: 25 };
  const p10 = { buffer: "tech-10.01" as const, mv: -178, tempC: 25 };

  it("0 or more than 3 points", () => {
    expectCode(() => fitPh([]), "point-count");
    expectCode(() => fitPh([p7, p4, p10, { ...p4, buffer: "phthalate-0.05m" }]), "point-count");
  });

  it("two points in the same buffer", () => {
    expectCode(() => fitPh([p7, { ...p7, mv: 3, tempC: 20 }]), "duplicate-buffer");
    expectCode(() => fitPh([p7, p4, { ...p4, mv: 170 }]), "duplicate-buffer");
    const cert = { points: [[20, 7.02], [25, 7.0]] as [number, number][] };
    const same = { points: [[25, 7.0], [20, 7.02]] as [number, number][] };
    expectCode(() => fitPh([{ ...p7, buffer: cert }, { ...p7, buffer: same }]), "duplicate-buffer");
  });

  it("buffers less than 1 pH apart", () => {
    expectCode(() => fitPh([p7, { buffer: "phosphate-0.025m", mv: 8, tempC: 25 }]), "buffers-too-close");
  });

  it("a point's temperature outside its buffer's table", () => {
    expectCode(() => fitPh([p7, { ...p4, tempC: 38 }]), "temperature-out-of-range");
  });

  it("non-finite numbers", () => {
    expectCode(() => fitPh([{ ...p7, mv: Number.NaN }]), "non-finite");
    expectCode(() => fitPh([p7, { ...p4, tempC: Number.POSITIVE_INFINITY }]), "non-finite");
    expectCode(() => phFromMv(Number.NaN, 25, { slopePct: 100, offsetMv: 0 }), "non-finite");
    expectCode(() => phFromMv(10, 25, { slopePct: 100, offsetMv: Number.NaN }), "non-finite");
    expectCode(() => nernstSlopeMv(Number.NaN), "non-finite");
  });

  it("zero or negative slope", () => {
    expectCode(() => phFromMv(10, 25, { slopePct: 0, offsetMv: 0 }), "zero-slope");
    expectCode(() => phFromMv(10, 25, { slopePct: -98, offsetMv: 0 }), "negative-slope");
    expectCode(() => fitPh([p7], { previous: { slopePct: 0, offsetMv: 0 } }), "zero-slope");
  });

  it("unknown buffer id", () => {
    expectCode(() => fitPh([{ ...p7, buffer: "tech-6.86" as "tech-7.00" }]), "unknown-buffer");
  });

  it("temperature at or below absolute zero", () => {
    expectCode(() => nernstSlopeMv(-273.15), "temperature-out-of-range");
    expectCode(() => phFromMv(0, -300, { slopePct: 100, offsetMv: 0 }), "temperature-out-of-range");
  });
});

describe("fitPhStability (common practice: less than 0.01 pH over 30 s)", () => {
  const flat = (from: number, to: number, stepMs: number, ph: (t: number) => number) => {
    const out: { t: number; ph: number }[] = [];
    for (let t = from; t <= to; t += stepMs) out.push({ t, ph: ph(t) });
    return out;
  };

  it("a reading within ±0.004 over 30 s is stable", () => {
    const samples = flat(0, 30000, 1000, (t) => 7 + 0.004 * Math.sin(t / 3000));
    const r = fitPhStability(samples, {});
    expect(r.stable).toBe(true);
    expect(r.coveredMs).toBe(30000);
    expect(r.spread).toBeLessThan(0.01);
  });

  it("a spread of 0.01 or more is not stable", () => {
    const samples = flat(0, 30000, 1000, (t) => (t === 15000 ? 7.01 : 7.0));
    const r = fitPhStability(samples, {});
    expectNear(r.spread, 0.01, 1e-9);
    expect(r.stable).toBe(false);
  });

  it("samples covering only 20 s of the window are not stable yet", () => {
    const r = fitPhStability(flat(10000, 30000, 1000, () => 7), {});
    expect(r.stable).toBe(false);
    expect(r.coveredMs).toBe(20000);
  });

  it("older drifting samples outside the window are ignored", () => {
    const samples = flat(0, 60000, 1000, (t) => (t < 25000 ? 6.5 + t / 50000 : 7.0));
    expect(fitPhStability(samples, {}).stable).toBe(true);
  });

  it("sparse samples still cover the window through the last sample before it", () => {
    const samples = flat(0, 35000, 7000, () => 4.01);
    const r = fitPhStability(samples, {});
    expect(r.coveredMs).toBe(30000);
    expect(r.stable).toBe(true);
  });

  it("order of samples does not matter; options are honoured; no samples is not stable", () => {
    const samples = flat(0, 10000, 500, () => 7).reverse();
    expect(fitPhStability(samples, { windowMs: 10000 }).stable).toBe(true);
    expect(fitPhStability(samples, {}).stable).toBe(false);
    const noisy = flat(0, 30000, 1000, (t) => 7 + (t % 2000 === 0 ? 0.015 : 0));
    expect(fitPhStability(noisy, { maxSpread: 0.02 }).stable).toBe(true);
    expect(fitPhStability([], {})).toEqual({ stable: false, spread: 0, coveredMs: 0 });
  });

  it("bad numbers throw", () => {
    expectCode(() => fitPhStability([{ t: 0, ph: Number.NaN }], {}), "non-finite");
    expectCode(() => fitPhStability([{ t: 0, ph: 7 }], { windowMs: 0 }), "invalid-parameter");
  });
});

describe("suggestNextDue (common practice: 30-day maximum; drift rule of DOMAIN.md section 1)", () => {
  const t0 = Date.UTC(2025, 0, 1);
  const day = (n: number) => t0 + n * DAY_MS;

  it("drift is the mean of |error| / days since the calibration before it; slow drift is capped at 30 days", () => {
    const r = suggestNextDue({
      lastCalibratedAt: day(60),
      asFoundErrors: [
        { at: day(0), errorPh: 0.05 },
        { at: day(30), errorPh: 0.06 },
        { at: day(60), errorPh: -0.03 },
      ],
    });
    expectNear(r.driftPhPerDay ?? Number.NaN, (0.06 / 30 + 0.03 / 30) / 2, 1e-12);
    expect(r.nextDueAt).toBe(day(90));
  });

  it("fast drift brings the due date forward to where the error reaches the tolerance", () => {
    const r = suggestNextDue({
      lastCalibratedAt: day(30),
      asFoundErrors: [
        { at: day(0), errorPh: 0 },
        { at: day(30), errorPh: 0.15 },
      ],
    });
    expectNear(r.driftPhPerDay ?? Number.NaN, 0.005, 1e-12);
    expect(r.nextDueAt).toBe(day(50));
  });

  it("an explicit previous calibration time dates a single check; options are honoured", () => {
    const r = suggestNextDue({
      lastCalibratedAt: day(20),
      asFoundErrors: [{ at: day(20), errorPh: -0.04, previousCalibratedAt: day(0) }],
      maxIntervalDays: 60,
      tolerancePh: 0.05,
    });
    expectNear(r.driftPhPerDay ?? Number.NaN, 0.002, 1e-12);
    expect(r.nextDueAt).toBe(day(45));
  });

  it("no dated check gives no drift and the maximum interval", () => {
    expect(suggestNextDue({ lastCalibratedAt: day(0), asFoundErrors: [] })).toEqual({
      driftPhPerDay: null,
      nextDueAt: day(30),
    });
    const one = suggestNextDue({ lastCalibratedAt: day(0), asFoundErrors: [{ at: day(0), errorPh: 0.2 }] });
    expect(one.driftPhPerDay).toBeNull();
    expect(one.nextDueAt).toBe(day(30));
  });

  it("zero drift gives the maximum interval", () => {
    const r = suggestNextDue({
      lastCalibratedAt: day(10),
      asFoundErrors: [
        { at: day(0), errorPh: 0 },
        { at: day(10), errorPh: 0 },
      ],
      maxIntervalDays: 14,
    });
    expect(r.driftPhPerDay).toBe(0);
    expect(r.nextDueAt).toBe(day(24));
  });

  it("bad input throws", () => {
    expectCode(
      () =>
        suggestNextDue({
          lastCalibratedAt: day(0),
          asFoundErrors: [{ at: day(0), errorPh: 0.1, previousCalibratedAt: day(1) }],
        }),
      "invalid-parameter",
    );
    expectCode(() => suggestNextDue({ lastCalibratedAt: Number.NaN, asFoundErrors: [] }), "non-finite");
    expectCode(
      () => suggestNextDue({ lastCalibratedAt: day(0), asFoundErrors: [], maxIntervalDays: 0 }),
      "invalid-parameter",
    );
  });
});

describe("calibrationStatus (common practice: 30-day interval)", () => {
  const t0 = Date.UTC(2025, 5, 1);
  const at = (days: number) => t0 + days * DAY_MS;

  it("never calibrated", () => {
    expect(calibrationStatus({ lastAcceptedAt: null, intervalDays: 30, now: at(0) })).toBe("never");
  });
  it("current, due soon within 5 days, lapsed from the due time", () => {
    const s = (days: number) => calibrationStatus({ lastAcceptedAt: t0, intervalDays: 30, now: at(days) });
    expect(s(0)).toBe("current");
    expect(s(24.99)).toBe("current");
    expect(s(25)).toBe("due-soon");
    expect(s(29.99)).toBe("due-soon");
    expect(s(30)).toBe("lapsed");
    expect(s(45)).toBe("lapsed");
  });
  it("dueSoonDays is honoured", () => {
    expect(calibrationStatus({ lastAcceptedAt: t0, intervalDays: 30, now: at(21), dueSoonDays: 10 })).toBe("due-soon");
    expect(calibrationStatus({ lastAcceptedAt: t0, intervalDays: 30, now: at(29), dueSoonDays: 0 })).toBe("current");
  });
  it("bad input throws", () => {
    expectCode(() => calibrationStatus({ lastAcceptedAt: t0, intervalDays: 0, now: at(1) }), "invalid-parameter");
    expectCode(() => calibrationStatus({ lastAcceptedAt: Number.NaN, intervalDays: 30, now: at(1) }), "non-finite");
  });
});
