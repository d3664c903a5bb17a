// The zod schemas of every settings form and route: the browser validates with them (react-hook-form)
// and the server parses with the very same ones, so a message shown under a field is the same on both.
// Pure: no I/O. Units as stored (EC in µS/cm, times in ms epoch, intervals in days or minutes).
import { z } from "zod";
import { EC_UNITS, PROBE_KINDS, ROLES } from "./enums";
import { PHYSICAL_RANGE } from "./ranges";

const name = (what: string, max = 80) =>
  z
    .string({ error: `Enter a ${what}.` })
    .trim()
    .min(1, `Enter a ${what}.`)
    .max(max, `Keep the ${what} to ${max} characters or fewer.`);

const num = (what: string) => z.number({ error: `Enter the ${what} as a number.` }).finite(`Enter the ${what} as a number.`);
const int = (what: string, min: number, max: number, unit = "") =>
  num(what)
    .int(`Enter the ${what} as a whole number.`)
    .min(min, `The ${what} must be at least ${min}${unit}.`)
    .max(max, `The ${what} must be at most ${max}${unit}.`);
const id = (what: string) => z.number({ error: `Choose a ${what}.` }).int(`Choose a ${what}.`).positive(`Choose a ${what}.`);

/** Destructive requests must say so explicitly; an empty body never deletes anything. */
const confirmed = z.literal(true, { error: "Confirm this change (send confirm: true)." });

const role = z.enum(ROLES, { error: "Choose a role: owner, grower or night manager." });
const email = z
  .email({ error: "Enter a valid e-mail address." })
  .max(200, "Keep the e-mail address to 200 characters or fewer.")
  .transform((e) => e.toLowerCase());

/** Refuses an update that changes nothing (so a stray `{}` is a 400, not a silent audit entry). */
function somethingToChange<T extends z.ZodObject>(schema: T) {
  return schema.refine((v) => Object.values(v).some((x) => x !== undefined), { message: "Nothing to change: send at least one field." });
}

// ── Users ──────────────────────────────────────────────────────────────────────────────
export const inviteUserSchema = z.object({ email, name: name("name"), role });
export type InviteUserInput = z.input<typeof inviteUserSchema>;

export const updateUserSchema = somethingToChange(z.object({ role: role.optional(), active: z.boolean().optional() }));

export const PASSWORD_MIN = 10;
export const acceptInvitationSchema = z
  .object({
    token: z.string().min(10, "This invitation link is incomplete.").max(4000),
    password: z
      .string({ error: "Choose a password." })
      .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
      .max(200, "Keep the password to 200 characters or fewer."),
    repeat: z.string({ error: "Type the password again." }),
  })
  .refine((v) => v.password === v.repeat, { path: ["repeat"], message: "The two passwords differ." });
export type AcceptInvitationInput = z.input<typeof acceptInvitationSchema>;

export const organisationSchema = z.object({ name: name("farm name", 120) });

// ── Sites and zones ────────────────────────────────────────────────────────────────────
export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

export const DEFAULT_MAX_CALIBRATION_DAYS = 30;

export const siteSchema = z
  .object({
    name: name("site name"),
    timeZone: z.string().trim().min(1, "Choose a time zone.").refine(isTimeZone, "Choose a time zone from the list (for example Europe/Dublin)."),
    dayStartHour: int("day start hour", 0, 23),
    nightStartHour: int("night start hour", 0, 23),
    dayRole: role,
    nightRole: role,
    escalateAfterMinutes: int("escalation delay", 1, 240, " min"),
    maxCalibrationIntervalDays: int("maximum calibration interval", 1, 365, " days"),
    maxHoldMinutes: int("maximum hold length", 5, 1440, " min"),
  })
  .refine((s) => s.dayStartHour !== s.nightStartHour, { path: ["nightStartHour"], message: "The night shift must start at a different hour from the day shift." });
export type SiteInput = z.input<typeof siteSchema>;

export const SITE_DEFAULTS: z.output<typeof siteSchema> = {
  name: "",
  timeZone: "UTC",
  dayStartHour: 7,
  nightStartHour: 19,
  dayRole: "grower",
  nightRole: "night_manager",
  escalateAfterMinutes: 15,
  maxCalibrationIntervalDays: DEFAULT_MAX_CALIBRATION_DAYS,
  maxHoldMinutes: 240,
};

export const zoneSchema = z.object({ siteId: id("site"), name: name("zone name") });
export const renameZoneSchema = z.object({ name: name("zone name") });

// ── Tanks ──────────────────────────────────────────────────────────────────────────────
const inRange = (what: string, [lo, hi]: readonly [number, number], unit: string) =>
  num(what).min(lo, `The ${what} must be at least ${lo}${unit}.`).max(hi, `The ${what} must be at most ${hi}${unit}.`);

export const tankSchema = z
  .object({
    siteId: id("site"),
    zoneId: id("zone").nullable(),
    name: name("tank name"),
    crop: name("crop"),
    phMin: inRange("pH minimum", PHYSICAL_RANGE.ph, ""),
    phMax: inRange("pH maximum", PHYSICAL_RANGE.ph, ""),
    ecMinUs: inRange("EC minimum", PHYSICAL_RANGE.ecUs, " µS/cm"),
    ecMaxUs: inRange("EC maximum", PHYSICAL_RANGE.ecUs, " µS/cm"),
    tempMin: inRange("temperature minimum", PHYSICAL_RANGE.tempC, " °C"),
    tempMax: inRange("temperature maximum", PHYSICAL_RANGE.tempC, " °C"),
    // DOMAIN.md section 3: about 0.019–0.021 per °C for nutrient solutions (common practice).
    ecAlphaPerC: num("temperature coefficient").min(0, "The temperature coefficient cannot be negative.").max(0.05, "The temperature coefficient must be at most 0.05 per °C."),
    spotCheckTolerancePh: num("pH spot-check tolerance").gt(0, "The pH spot-check tolerance must be above 0.").max(1, "The pH spot-check tolerance must be at most 1."),
    spotCheckToleranceEcUs: num("EC spot-check tolerance").gt(0, "The EC spot-check tolerance must be above 0.").max(2000, "The EC spot-check tolerance must be at most 2000 µS/cm."),
    calibrationIntervalDays: int("calibration interval", 1, 365, " days"),
  })
  .refine((t) => t.phMin < t.phMax, { path: ["phMax"], message: "The pH maximum must be above the pH minimum." })
  .refine((t) => t.ecMinUs < t.ecMaxUs, { path: ["ecMaxUs"], message: "The EC maximum must be above the EC minimum." })
  .refine((t) => t.tempMin < t.tempMax, { path: ["tempMax"], message: "The temperature maximum must be above the minimum." });
export type TankInput = z.input<typeof tankSchema>;

// ── Probes ─────────────────────────────────────────────────────────────────────────────
const serial = z
  .string({ error: "Enter the probe's serial number." })
  .trim()
  .min(1, "Enter the probe's serial number.")
  .max(64, "Keep the serial number to 64 characters or fewer.")
  .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, "Use letters, digits, dots, dashes and slashes only in the serial number.");
const cellConstant = num("nominal cell constant").gt(0, "The nominal cell constant must be above 0 /cm.").max(50, "The nominal cell constant must be at most 50 /cm.");

export const probeSchema = z
  .object({
    tankId: id("tank"),
    kind: z.enum(PROBE_KINDS, { error: "Choose pH, EC or temperature." }),
    serial,
    nominalCellConstant: cellConstant.nullable(),
  })
  .refine((p) => p.kind !== "ec" || p.nominalCellConstant !== null, { path: ["nominalCellConstant"], message: "An EC probe needs its nominal cell constant (printed on the probe, often 1.0 /cm)." })
  .refine((p) => p.kind === "ec" || p.nominalCellConstant === null, { path: ["nominalCellConstant"], message: "Only EC probes have a cell constant." });
export type ProbeInput = z.input<typeof probeSchema>;

export const moveProbeSchema = z.object({ tankId: id("tank") });
export const retireProbeSchema = z.object({ confirm: confirmed });
export const replaceProbeSchema = z.object({ serial, nominalCellConstant: cellConstant.nullable(), confirm: confirmed });
export type ReplaceProbeInput = z.input<typeof replaceProbeSchema>;

// ── Devices ────────────────────────────────────────────────────────────────────────────
// Stricter than what the broker accepts (ingest/topics.ts CONTROLLER_ID_PATTERN), so every id issued
// here is also a valid client id there; "tidewell-" is reserved for the service accounts.
export const CONTROLLER_ID_PATTERN = /^(?!tidewell-)[a-z0-9][a-z0-9-]{1,62}$/;
export const registerDeviceSchema = z.object({
  tankId: id("tank"),
  controllerId: z
    .string({ error: "Enter the controller id." })
    .trim()
    .toLowerCase()
    .regex(CONTROLLER_ID_PATTERN, "Use 2–63 lower-case letters, digits and dashes, not starting with tidewell- (for example ctl-house3-t1)."),
});
export type RegisterDeviceInput = z.input<typeof registerDeviceSchema>;
export const deviceCredentialChangeSchema = z.object({ confirm: confirmed });

// ── Preferences ────────────────────────────────────────────────────────────────────────
export const preferencesSchema = somethingToChange(
  z.object({
    ecUnit: z.enum(EC_UNITS, { error: "Choose mS/cm, µS/cm, ppm (500), ppm (700) or CF." }).optional(),
    notifyEmail: z.boolean({ error: "Choose on or off." }).optional(),
    wallSound: z.boolean({ error: "Choose on or off." }).optional(),
  }),
);
export type PreferencesInput = z.input<typeof preferencesSchema>;

// ── Audit log and exports (query strings, so numbers arrive as text) ──────────────────
const msQuery = (what: string) => z.coerce.number({ error: `Give ${what} as milliseconds since the epoch.` }).int(`Give ${what} as whole milliseconds.`).nonnegative(`Give ${what} as milliseconds since the epoch.`);

export const auditQuerySchema = z.object({
  entity: z.string().trim().max(40).optional(),
  action: z.string().trim().max(60).optional(),
  user: z.coerce.number().int().positive().optional(),
  from: msQuery("from").optional(),
  to: msQuery("to").optional(),
  limit: z.coerce.number().int().min(1).max(5000).default(1000),
});

export const MAX_EXPORT_DAYS = 366;
function sensibleRange<T extends { from: number; to: number }>(schema: z.ZodType<T>) {
  return schema
    .refine((q) => q.to > q.from, { path: ["to"], message: "The end must be after the start." })
    .refine((q) => q.to - q.from <= MAX_EXPORT_DAYS * 86_400_000, { path: ["to"], message: `Export at most ${MAX_EXPORT_DAYS} days at a time.` });
}

export const readingsExportSchema = sensibleRange(
  z.object({ tank: z.coerce.number({ error: "Choose a tank." }).int("Choose a tank.").positive("Choose a tank."), from: msQuery("from"), to: msQuery("to") }),
);
export const calibrationsExportSchema = sensibleRange(z.object({ site: z.coerce.number().int().positive().optional(), from: msQuery("from"), to: msQuery("to") }));
