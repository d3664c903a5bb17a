// Spot checks: a handheld meter's reading compared with Tidewell's corrected reading at that time
// (the nearest within ±2 min). A difference past the tank's tolerance suggests recalibrating.
import Papa from "papaparse";
import { z } from "zod";
import { and, desc, eq, gte, inArray, isNotNull, lte, sql } from "drizzle-orm";
import type { Db } from "../client";
import { probes, readings, sites, spotChecks, tanks } from "../schema";
import { notFound, unprocessable } from "../../app/_server/errors";
import { audit, type Tx } from "./audit";
import { probeInOrg, type ProbeRow, type TankRow } from "./calibration-scope";
import type { Actor } from "./calibration-runs";

export const MATCH_WINDOW_MS = 2 * 60_000;
export const MAX_CSV_ROWS = 2000;

export interface SpotCheckInput {
  probeId: number;
  takenAt: number;
  /** pH, or EC in µS/cm at 25 °C. */
  meterValue: number;
  note?: string;
}

/** Tidewell's corrected reading nearest to a time, within ±2 min. */
export async function nearestReading(db: Db | Tx, probeId: number, at: number) {
  const [row] = await db
    .select({ ts: readings.ts, value: readings.value })
    .from(readings)
    .where(and(eq(readings.probeId, probeId), gte(readings.ts, at - MATCH_WINDOW_MS), lte(readings.ts, at + MATCH_WINDOW_MS), isNotNull(readings.value)))
    .orderBy(sql`abs(${readings.ts} - ${at})`)
    .limit(1);
  return row && row.value !== null ? { ts: row.ts, value: row.value } : null;
}

function tolerance(probe: ProbeRow, tank: TankRow) {
  return probe.kind === "ph" ? tank.spotCheckTolerancePh : tank.spotCheckToleranceEcUs;
}

function checkValue(probe: ProbeRow, value: number): string | null {
  if (probe.kind === "ph" && (value < 0 || value > 14)) return "A pH reading must be between 0 and 14";
  if (probe.kind === "ec" && (value < 0 || value > 20_000)) return "An EC reading must be between 0 and 20 mS/cm";
  if (probe.kind === "temp") return "Spot checks are for pH and EC probes";
  return null;
}

/** The comparison columns of a spot check: the meter against Tidewell's nearest reading. */
async function compared(tx: Tx, probe: ProbeRow, tank: TankRow, input: Omit<SpotCheckInput, "probeId">) {
  const match = await nearestReading(tx, probe.id, input.takenAt);
  const difference = match ? input.meterValue - match.value : null;
  return {
    takenAt: input.takenAt,
    meterValue: input.meterValue,
    tidewellValue: match?.value ?? null,
    tidewellTs: match?.ts ?? null,
    difference,
    pastTolerance: difference !== null && Math.abs(difference) > tolerance(probe, tank) + 1e-9,
    note: input.note?.trim() || null,
  };
}

async function insertSpotCheck(tx: Tx, user: Actor, probe: ProbeRow, tank: TankRow, input: SpotCheckInput) {
  const [row] = await tx
    .insert(spotChecks)
    .values({ probeId: probe.id, enteredBy: user.id, ...(await compared(tx, probe, tank, input)) })
    .returning();
  return row;
}

/** A spot check of the caller's organisation, with its probe and tank; 404 otherwise. */
export async function spotCheckInOrg(db: Db, orgId: number, id: number) {
  const [found] = await db
    .select({ row: spotChecks, probe: probes, tank: tanks })
    .from(spotChecks)
    .innerJoin(probes, eq(probes.id, spotChecks.probeId))
    .innerJoin(tanks, eq(tanks.id, probes.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(spotChecks.id, id), eq(sites.orgId, orgId)));
  if (!found) throw notFound("That spot check");
  return found;
}

/** What the audit log keeps of a spot check, so an edit or a deletion can be traced. */
const auditedValues = (r: typeof spotChecks.$inferSelect) => ({ takenAt: new Date(r.takenAt).toISOString(), meterValue: r.meterValue, note: r.note });

/** Corrects a spot check (time, meter value, note) and compares it again. */
export async function editSpotCheck(db: Db, user: Actor, id: number, input: Omit<SpotCheckInput, "probeId">, now = Date.now()) {
  const { row, probe, tank } = await spotCheckInOrg(db, user.orgId, id);
  const bad = checkValue(probe, input.meterValue);
  if (bad) throw unprocessable(bad, { meterValue: bad });
  if (input.takenAt > now + 60_000) throw unprocessable("The reading's time is in the future.", { takenAt: "Check the time" });
  return db.transaction(async (tx) => {
    const [updated] = await tx.update(spotChecks).set(await compared(tx, probe, tank, input)).where(eq(spotChecks.id, id)).returning();
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "spot-check.edit", entity: "spot_check", entityId: id, detail: { probe: probe.serial, before: auditedValues(row), after: auditedValues(updated) }, at: now });
    return { spotCheck: updated, tolerance: tolerance(probe, tank), kind: probe.kind };
  });
}

/** Deletes a spot check entered in error; the audit entry keeps what it said. */
export async function deleteSpotCheck(db: Db, user: Actor, id: number, now = Date.now()) {
  const { row, probe } = await spotCheckInOrg(db, user.orgId, id);
  await db.transaction(async (tx) => {
    await tx.delete(spotChecks).where(eq(spotChecks.id, id));
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "spot-check.delete", entity: "spot_check", entityId: id, detail: { probe: probe.serial, deleted: auditedValues(row) }, at: now });
  });
  return { deleted: id };
}

export async function addSpotCheck(db: Db, user: Actor, input: SpotCheckInput, now = Date.now()) {
  const { probe, tank } = await probeInOrg(db, user.orgId, input.probeId);
  const bad = checkValue(probe, input.meterValue);
  if (bad) throw unprocessable(bad, { meterValue: bad });
  if (input.takenAt > now + 60_000) throw unprocessable("The reading's time is in the future.", { takenAt: "Check the time" });
  return db.transaction(async (tx) => {
    const row = await insertSpotCheck(tx, user, probe, tank, input);
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "spot-check.add", entity: "spot_check", entityId: row.id, detail: { probe: probe.serial }, at: now });
    return { spotCheck: row, tolerance: tolerance(probe, tank), kind: probe.kind };
  });
}

const csvRow = z.object({
  probe: z.string().trim().min(1, "The probe serial is missing"),
  taken_at: z.string().trim().min(1, "The time is missing"),
  value: z.string().trim().min(1, "The value is missing"),
  unit: z.string().trim().optional(),
  note: z.string().trim().max(500, "The note is longer than 500 characters").optional(),
});

/** ISO 8601 date-time; without a zone it is read as UTC. */
export function parseCsvTime(text: string): number | null {
  const m = /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2}(?::\d{2}(?:\.\d{1,3})?)?)(Z|[+-]\d{2}:?\d{2})?$/.exec(text);
  if (!m) return null;
  const zone = (m[3] ?? "Z").replace(/^([+-]\d{2})(\d{2})$/, "$1:$2");
  const t = Date.parse(`${m[1]}T${m[2]}${zone}`);
  return Number.isFinite(t) ? t : null;
}

/** A meter value in the unit given, to Tidewell's storage unit (pH, or µS/cm). */
function toStorage(kind: ProbeRow["kind"], value: number, unit: string | undefined): number | string {
  const u = (unit ?? "").toLowerCase().replace("µ", "u");
  if (kind === "ph") return u === "" || u === "ph" ? value : `The unit "${unit}" is not a pH unit`;
  if (u === "" || u === "ms/cm") return value * 1000;
  if (u === "us/cm") return value;
  return `The unit "${unit}" is not an EC unit (use mS/cm or µS/cm)`;
}

export interface CsvImportResult {
  imported: number;
  pastTolerance: number;
}

/**
 * Imports a CSV of handheld readings (columns probe, taken_at, value, unit?, note?): every row is
 * checked first and all are written in one transaction, so a file with any bad row imports nothing.
 */
export async function importSpotChecksCsv(db: Db, user: Actor, csv: string, now = Date.now()): Promise<CsvImportResult> {
  const parsed = Papa.parse<Record<string, string>>(csv.trim(), { header: true, skipEmptyLines: true, transformHeader: (h) => h.trim().toLowerCase() });
  const errors: Record<string, string> = {};
  for (const e of parsed.errors) errors[`row ${(e.row ?? 0) + 2}`] ??= e.message;
  const missing = ["probe", "taken_at", "value"].filter((c) => !parsed.meta.fields?.includes(c));
  if (missing.length) throw unprocessable(`The CSV needs the columns probe, taken_at and value (missing: ${missing.join(", ")}).`, { file: `Missing columns: ${missing.join(", ")}` });
  if (parsed.data.length === 0) throw unprocessable("The CSV has no rows.", { file: "No rows" });
  if (parsed.data.length > MAX_CSV_ROWS) throw unprocessable(`The CSV has ${parsed.data.length} rows; import at most ${MAX_CSV_ROWS} at a time.`, { file: "Too many rows" });

  const serials = [...new Set(parsed.data.map((r) => (r.probe ?? "").trim()).filter(Boolean))];
  const known = serials.length
    ? await db
        .select({ probe: probes, tank: tanks })
        .from(probes)
        .innerJoin(tanks, eq(tanks.id, probes.tankId))
        .innerJoin(sites, eq(sites.id, tanks.siteId))
        .where(and(inArray(probes.serial, serials), eq(sites.orgId, user.orgId)))
    : [];
  const bySerial = new Map(known.map((k) => [k.probe.serial, k]));

  const rows: { probe: ProbeRow; tank: TankRow; input: SpotCheckInput }[] = [];
  parsed.data.forEach((raw, i) => {
    const label = `row ${i + 2}`; // the header is row 1
    if (errors[label]) return;
    const r = csvRow.safeParse(raw);
    if (!r.success) {
      errors[label] = r.error.issues[0].message;
      return;
    }
    const found = bySerial.get(r.data.probe);
    if (!found) return void (errors[label] = `No probe with serial ${r.data.probe} in your farm`);
    const takenAt = parseCsvTime(r.data.taken_at);
    if (takenAt === null) return void (errors[label] = `"${r.data.taken_at}" is not a date and time like 2026-12-01T14:05Z`);
    if (takenAt > now + 60_000) return void (errors[label] = "The time is in the future");
    const number = Number(r.data.value.replace(",", "."));
    if (!Number.isFinite(number)) return void (errors[label] = `"${r.data.value}" is not a number`);
    const value = toStorage(found.probe.kind, number, r.data.unit);
    if (typeof value === "string") return void (errors[label] = value);
    const bad = checkValue(found.probe, value);
    if (bad) return void (errors[label] = bad);
    rows.push({ ...found, input: { probeId: found.probe.id, takenAt, meterValue: value, note: r.data.note } });
  });
  const errorCount = Object.keys(errors).length;
  if (errorCount) {
    throw unprocessable(`${errorCount} row${errorCount > 1 ? "s" : ""} of the CSV could not be read; nothing was imported. Fix ${errorCount > 1 ? "them" : "it"} and import the file again.`, errors);
  }
  return db.transaction(async (tx) => {
    let past = 0;
    for (const r of rows) if ((await insertSpotCheck(tx, user, r.probe, r.tank, r.input)).pastTolerance) past++;
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "spot-check.import", entity: "spot_check", detail: { rows: rows.length }, at: now });
    return { imported: rows.length, pastTolerance: past };
  });
}

export async function listSpotChecks(db: Db, orgId: number, probeId: number, limit = 50) {
  const { probe, tank } = await probeInOrg(db, orgId, probeId);
  const rows = await db.select().from(spotChecks).where(eq(spotChecks.probeId, probeId)).orderBy(desc(spotChecks.takenAt)).limit(limit);
  return { rows, tolerance: tolerance(probe, tank), kind: probe.kind };
}
