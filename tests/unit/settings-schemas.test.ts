// The shared settings schemas: what each form and route refuses, and the message it shows.
import { describe, expect, it } from "vitest";
import { CONTROLLER_ID_PATTERN as BROKER_CONTROLLER_ID } from "@/ingest/topics";
import { CROP_PRESETS, CROP_NAMES, presetBand } from "@/lib/settings/crop-presets";
import {
  SITE_DEFAULTS,
  acceptInvitationSchema,
  auditQuerySchema,
  calibrationsExportSchema,
  inviteUserSchema,
  moveProbeSchema,
  organisationSchema,
  preferencesSchema,
  probeSchema,
  readingsExportSchema,
  registerDeviceSchema,
  replaceProbeSchema,
  retireProbeSchema,
  siteSchema,
  tankSchema,
  updateUserSchema,
  zoneSchema,
} from "@/lib/settings/schemas";
import type { z } from "zod";

function fields(schema: z.ZodType, value: unknown): Record<string, string> {
  const r = schema.safeParse(value);
  if (r.success) return {};
  const out: Record<string, string> = {};
  for (const issue of r.error.issues) out[issue.path.join(".") || "_"] ??= issue.message;
  return out;
}

const tank = { siteId: 1, zoneId: null, name: "T1", crop: "leafy greens", ...presetBand("leafy greens"), ecAlphaPerC: 0.019, spotCheckTolerancePh: 0.1, spotCheckToleranceEcUs: 100, calibrationIntervalDays: 30 };

describe("users and invitations", () => {
  it("invites with a lower-cased e-mail, a name and a known role", () => {
    expect(inviteUserSchema.parse({ email: "New.Grower@Farm.Example", name: " Ana ", role: "grower" })).toEqual({ email: "new.grower@farm.example", name: "Ana", role: "grower" });
    expect(fields(inviteUserSchema, { email: "not-an-email", name: "", role: "boss" })).toEqual({
      email: "Enter a valid e-mail address.",
      name: "Enter a name.",
      role: "Choose a role: owner, grower or night manager.",
    });
  });

  it("refuses a user update that changes nothing", () => {
    expect(fields(updateUserSchema, {})._).toMatch(/Nothing to change/);
    expect(updateUserSchema.parse({ active: false })).toEqual({ active: false });
    expect(fields(updateUserSchema, { role: "admin" }).role).toMatch(/Choose a role/);
  });

  it("asks for a long enough password typed twice", () => {
    expect(fields(acceptInvitationSchema, { token: "x".repeat(40), password: "short", repeat: "short" }).password).toBe("Use at least 10 characters.");
    expect(fields(acceptInvitationSchema, { token: "x".repeat(40), password: "long enough pass", repeat: "long enough pazz" }).repeat).toBe("The two passwords differ.");
    expect(fields(acceptInvitationSchema, { token: "x", password: "long enough pass", repeat: "long enough pass" }).token).toMatch(/incomplete/);
  });

  it("names the farm", () => {
    expect(fields(organisationSchema, { name: "   " }).name).toBe("Enter a farm name.");
  });
});

describe("sites and zones", () => {
  it("accepts the defaults with a name, and a real time zone", () => {
    expect(siteSchema.safeParse({ ...SITE_DEFAULTS, name: "South house", timeZone: "Europe/Dublin" }).success).toBe(true);
    expect(fields(siteSchema, { ...SITE_DEFAULTS, name: "S", timeZone: "Mars/Olympus" }).timeZone).toMatch(/Choose a time zone/);
  });

  it("needs two different shift starts and sensible limits", () => {
    const f = fields(siteSchema, { ...SITE_DEFAULTS, name: "S", dayStartHour: 7, nightStartHour: 7, escalateAfterMinutes: 0, maxCalibrationIntervalDays: 400, maxHoldMinutes: 2 });
    expect(f).toMatchObject({
      escalateAfterMinutes: "The escalation delay must be at least 1 min.",
      maxCalibrationIntervalDays: "The maximum calibration interval must be at most 365 days.",
      maxHoldMinutes: "The maximum hold length must be at least 5 min.",
    });
    expect(fields(siteSchema, { ...SITE_DEFAULTS, name: "S", dayStartHour: 7, nightStartHour: 7 }).nightStartHour).toMatch(/different hour/);
    expect(fields(siteSchema, { ...SITE_DEFAULTS, name: "S", dayStartHour: 24 }).dayStartHour).toBe("The day start hour must be at most 23.");
  });

  it("needs a zone name and its site", () => {
    expect(fields(zoneSchema, { name: "" })).toEqual({ siteId: "Choose a site.", name: "Enter a zone name." });
  });
});

describe("tanks and target bands", () => {
  it("accepts every crop preset of DOMAIN.md section 4 as a target band", () => {
    // DOMAIN.md section 4 (common practice, from memory; growers edit them)
    expect(CROP_PRESETS["tomato (fruiting)"]).toEqual({ phMin: 5.5, phMax: 6.5, ecMinUs: 2000, ecMaxUs: 3500 });
    expect(CROP_PRESETS.cucumber).toEqual({ phMin: 5.5, phMax: 6.0, ecMinUs: 1700, ecMaxUs: 2500 });
    for (const crop of CROP_NAMES) expect(tankSchema.safeParse({ ...tank, crop, ...presetBand(crop) }).success, crop).toBe(true);
  });

  it("puts a reversed band's message under its maximum", () => {
    expect(fields(tankSchema, { ...tank, phMin: 6.5, phMax: 5.5 }).phMax).toBe("The pH maximum must be above the pH minimum.");
    expect(fields(tankSchema, { ...tank, ecMinUs: 1500, ecMaxUs: 1000 }).ecMaxUs).toBe("The EC maximum must be above the EC minimum.");
    expect(fields(tankSchema, { ...tank, tempMin: 25, tempMax: 20 }).tempMax).toMatch(/above the minimum/);
  });

  it("keeps bands inside the physical sanity ranges (DOMAIN.md section 4: pH 0–14, EC 0–20 mS/cm, −5 to 60 °C)", () => {
    const f = fields(tankSchema, { ...tank, phMin: -1, ecMaxUs: 25_000, tempMax: 70 });
    expect(f).toEqual({
      phMin: "The pH minimum must be at least 0.",
      ecMaxUs: "The EC maximum must be at most 20000 µS/cm.",
      tempMax: "The temperature maximum must be at most 60 °C.",
    });
  });

  it("refuses a negative temperature coefficient, a zero tolerance and a non-number", () => {
    const f = fields(tankSchema, { ...tank, ecAlphaPerC: -0.01, spotCheckTolerancePh: 0, calibrationIntervalDays: Number.NaN });
    expect(f.ecAlphaPerC).toBe("The temperature coefficient cannot be negative.");
    expect(f.spotCheckTolerancePh).toBe("The pH spot-check tolerance must be above 0.");
    expect(f.calibrationIntervalDays).toBe("Enter the calibration interval as a number.");
  });
});

describe("probes", () => {
  it("needs a nominal cell constant for EC probes only", () => {
    expect(fields(probeSchema, { tankId: 1, kind: "ec", serial: "EC-1", nominalCellConstant: null }).nominalCellConstant).toMatch(/needs its nominal cell constant/);
    expect(fields(probeSchema, { tankId: 1, kind: "ph", serial: "PH-1", nominalCellConstant: 1 }).nominalCellConstant).toBe("Only EC probes have a cell constant.");
    expect(probeSchema.safeParse({ tankId: 1, kind: "ec", serial: "EC-1", nominalCellConstant: 1.0 }).success).toBe(true);
  });

  it("takes serials the controller can report", () => {
    expect(fields(probeSchema, { tankId: 1, kind: "ph", serial: "PH 1; drop", nominalCellConstant: null }).serial).toMatch(/letters, digits/);
  });

  it("asks for explicit confirmation before retiring or replacing", () => {
    expect(fields(retireProbeSchema, {}).confirm).toMatch(/Confirm this change/);
    expect(fields(replaceProbeSchema, { serial: "PH-2", nominalCellConstant: null }).confirm).toMatch(/Confirm/);
    expect(fields(moveProbeSchema, {}).tankId).toBe("Choose a tank.");
  });
});

describe("devices", () => {
  it("issues only controller ids the broker also accepts", () => {
    for (const id of ["ctl-house3-t1", "ab", "c0ffee"]) {
      expect(registerDeviceSchema.safeParse({ tankId: 1, controllerId: id }).success, id).toBe(true);
      expect(BROKER_CONTROLLER_ID.test(id), id).toBe(true);
    }
    expect(registerDeviceSchema.parse({ tankId: 1, controllerId: " CTL-A1 " }).controllerId).toBe("ctl-a1");
    for (const id of ["tidewell-ingest", "a", "ctl/one", "-ctl", "ctl_1"]) expect(registerDeviceSchema.safeParse({ tankId: 1, controllerId: id }).success, id).toBe(false);
  });
});

describe("preferences", () => {
  it("takes one of the five EC units (DOMAIN.md section 3) and refuses an empty change", () => {
    expect(preferencesSchema.parse({ ecUnit: "ppm-700" })).toEqual({ ecUnit: "ppm-700" });
    expect(fields(preferencesSchema, { ecUnit: "mmho" }).ecUnit).toMatch(/Choose mS\/cm/);
    expect(fields(preferencesSchema, {})._).toMatch(/Nothing to change/);
    expect(fields(preferencesSchema, { wallSound: "yes" }).wallSound).toBe("Choose on or off.");
  });
});

describe("audit and export queries", () => {
  it("reads numbers from the query string", () => {
    expect(auditQuerySchema.parse({ from: "1000", user: "3" })).toEqual({ from: 1000, user: 3, limit: 1000 });
    expect(readingsExportSchema.parse({ tank: "4", from: "0", to: "86400000" })).toEqual({ tank: 4, from: 0, to: 86_400_000 });
  });

  it("refuses a backwards or over-long range and a missing tank", () => {
    expect(fields(readingsExportSchema, { tank: "4", from: "2000", to: "1000" }).to).toBe("The end must be after the start.");
    expect(fields(calibrationsExportSchema, { from: "0", to: String(400 * 86_400_000) }).to).toBe("Export at most 366 days at a time.");
    expect(fields(readingsExportSchema, { from: "0", to: "1" }).tank).toBeDefined();
  });
});
