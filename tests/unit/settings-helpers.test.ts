// Pure helpers of the settings screens: EC typed in the user's unit, audit text, file names, sections.
import { describe, expect, it } from "vitest";
import { ecInUnit } from "@/lib/display/units";
import { ecToMicrosiemens } from "@/lib/display/units";
import { describeAuditDetail } from "@/lib/settings/audit-text";
import { csvFilename } from "@/lib/settings/csv-filename";
import { maySee, sectionsFor } from "@/lib/settings/sections";
import { EC_UNITS } from "@/lib/settings/enums";

describe("EC typed in the display unit", () => {
  it("converts back to µS/cm with the DOMAIN.md section 3 factors (common practice)", () => {
    // ppm-500 = EC (mS/cm) × 500; ppm-700 = EC × 700; CF = EC × 10
    expect(ecToMicrosiemens(1.4, "mS/cm")).toBeCloseTo(1400, 9);
    expect(ecToMicrosiemens(700, "ppm-500")).toBeCloseTo(1400, 9);
    expect(ecToMicrosiemens(980, "ppm-700")).toBeCloseTo(1400, 9);
    expect(ecToMicrosiemens(14, "CF")).toBeCloseTo(1400, 9);
    expect(ecToMicrosiemens(1413, "µS/cm")).toBe(1413);
  });

  it("is the inverse of the display conversion for every unit", () => {
    for (const unit of EC_UNITS) for (const us of [0, 800, 2770, 12_880]) expect(ecToMicrosiemens(ecInUnit(us, unit), unit), unit).toBeCloseTo(us, 6);
  });
});

describe("audit detail", () => {
  it("reads a change as old → new", () => {
    expect(describeAuditDetail({ name: "L1", changed: { phMax: [6.5, 6.4], crop: ["lettuce", "basil"] } })).toBe("name L1 · phMax 6.5 → 6.4 · crop lettuce → basil");
    expect(describeAuditDetail(null)).toBe("");
    expect(describeAuditDetail({ tanksIntervalLowered: ["A", "B"] })).toBe("tanksIntervalLowered A, B");
  });
});

describe("export file names", () => {
  it("are safe and dated", () => {
    expect(csvFilename("readings-L1 Butterhead", Date.UTC(2026, 10, 1), Date.UTC(2026, 11, 1))).toBe("readings-l1-butterhead-2026-11-01-to-2026-12-01.csv");
    expect(csvFilename("µ/?", 0, 86_400_000)).toBe("export-1970-01-01-to-1970-01-02.csv");
  });
});

describe("settings sections by role", () => {
  it("gives night managers their preferences only", () => {
    expect(sectionsFor("night_manager").map((s) => s.key)).toEqual(["preferences"]);
    expect(sectionsFor("grower").map((s) => s.key)).toEqual(["tanks", "probes", "labels", "preferences"]);
    expect(sectionsFor("owner")).toHaveLength(9);
    expect(maySee("grower", "devices")).toBe(false);
  });
});
