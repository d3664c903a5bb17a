import { describe, expect, it } from "vitest";
import { periodQuery, reportDateTime, reportFilename, reportPeriod, runResultText, asFoundText } from "@/lib/reports/format";
import { labelParams, labelUrl } from "@/lib/labels/links";

describe("calibration report text", () => {
  const now = Date.parse("2026-12-03T10:00:00Z");

  it("defaults the period to the twelve months up to today and caps it at 5 × 366 days", () => {
    expect(reportPeriod({}, now)).toMatchObject({ from: "2025-12-04", to: "2026-12-03", startMs: Date.parse("2025-12-04T00:00:00Z"), endMs: Date.parse("2026-12-04T00:00:00Z") });
    expect(reportPeriod({ from: "2000-01-01", to: "2026-12-03" }, now).from).toBe("2021-11-30");
    expect(periodQuery.safeParse({ from: "2026-02-01", to: "2026-01-01" }).success).toBe(false);
    expect(periodQuery.safeParse({ from: "1 Jan" }).success).toBe(false);
  });

  it("writes times in the site's time zone, with English month names", () => {
    expect(reportDateTime(Date.parse("2026-07-01T12:05:00Z"), "Europe/Dublin")).toBe("1 Jul 2026 13:05");
    expect(reportDateTime(Date.parse("2026-09-22T23:30:00Z"), "UTC")).toBe("22 Sep 2026 23:30");
    expect(reportDateTime(null, "UTC")).toBe("—");
  });

  it("states a run's fit and as-found error", () => {
    expect(runResultText({ status: "accepted", slopePct: 98.64, offsetMv: -0.04, cellConstant: null, deviationPct: null })).toBe("Slope 98.6 % · offset 0.0 mV");
    expect(runResultText({ status: "accepted", slopePct: null, offsetMv: null, cellConstant: 1.0281, deviationPct: 2.81 })).toBe("Cell constant 1.028 /cm · 2.8 % from nominal");
    expect(asFoundText({ asFoundErrorPh: 0.123, asFoundErrorPct: null })).toBe("As-found error +0.12 pH");
    expect(reportFilename("North Greenhouse", reportPeriod({}, now))).toBe("tidewell-calibration-North-Greenhouse-2025-12-04-to-2026-12-03.pdf");
  });
});

describe("label addresses", () => {
  it("are short absolute addresses under /go", () => {
    expect(labelUrl("http://farm.example:3000", "probe", 19)).toBe("http://farm.example:3000/go/probe/19");
    expect(labelParams.safeParse({ kind: "tank", id: "4" }).success).toBe(true);
    expect(labelParams.safeParse({ kind: "zone", id: "4" }).success).toBe(false);
    expect(labelParams.safeParse({ kind: "probe", id: "-1" }).success).toBe(false);
  });
});
