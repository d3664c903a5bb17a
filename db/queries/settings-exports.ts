// CSV exports for the owner: a tank's readings over a time range (streamed page by page, so a year
// of readings never sits in memory) and the calibration record.
import { and, asc, eq, gt, gte, inArray, lt, or } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationPoints, calibrationRuns, probes, readings, sites, tanks, users } from "../schema";
import { csvRows, csvTable } from "../../lib/settings/csv";
import { tankOfOrg } from "./settings-tanks";

const PAGE = 5000;
const UNIT = { ph: "pH", ec: "µS/cm at 25 °C", temp: "°C" } as const;
const RAW_UNIT = { ph: "mV", ec: "µS", temp: "°C" } as const;

export const READINGS_COLUMNS = ["time_utc", "ts_ms", "probe_serial", "measure", "raw", "raw_unit", "value", "unit", "quality", "calibration_run_id"];

/** Checks the tank belongs to the organisation, then returns the CSV as a stream of pages. */
export async function readingsCsv(db: Db, orgId: number, q: { tank: number; from: number; to: number }) {
  const tank = await tankOfOrg(db, orgId, q.tank);
  const tankProbes = await db.select().from(probes).where(eq(probes.tankId, tank.id));
  const probeById = new Map(tankProbes.map((p) => [p.id, p]));
  const probeIds = tankProbes.map((p) => p.id);
  const encoder = new TextEncoder();
  let cursor: { ts: number; probeId: number } | null = null;
  let headerSent = false;

  const stream = new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (!headerSent) {
        headerSent = true;
        controller.enqueue(encoder.encode(csvTable(READINGS_COLUMNS, [])));
        if (probeIds.length === 0) return controller.close();
        return;
      }
      const after = cursor ? or(gt(readings.ts, cursor.ts), and(eq(readings.ts, cursor.ts), gt(readings.probeId, cursor.probeId))) : undefined;
      const page = await db
        .select()
        .from(readings)
        .where(and(inArray(readings.probeId, probeIds), gte(readings.ts, q.from), lt(readings.ts, q.to), after))
        .orderBy(asc(readings.ts), asc(readings.probeId))
        .limit(PAGE);
      if (page.length === 0) return controller.close();
      const last = page[page.length - 1];
      cursor = { ts: last.ts, probeId: last.probeId };
      const rows = page.map((r) => {
        const p = probeById.get(r.probeId)!;
        return [new Date(r.ts).toISOString(), r.ts, p.serial, p.kind, r.raw, RAW_UNIT[p.kind], r.value ?? "", UNIT[p.kind], r.quality, r.calibrationRunId ?? ""];
      });
      controller.enqueue(encoder.encode(csvRows(rows)));
      if (page.length < PAGE) controller.close();
    },
  });
  return { tank, stream };
}

export const CALIBRATION_COLUMNS = [
  "run_id", "site", "tank", "probe_serial", "measure", "status", "source", "started_utc", "completed_utc", "effective_utc",
  "slope_pct", "offset_mv", "cell_constant_per_cm", "deviation_pct", "as_found_error_ph", "reasons", "standards_and_lots", "by", "note",
];

export async function calibrationsCsv(db: Db, orgId: number, q: { site?: number; from: number; to: number }) {
  const runs = await db
    .select({ run: calibrationRuns, serial: probes.serial, kind: probes.kind, tankName: tanks.name, siteName: sites.name, by: users.name })
    .from(calibrationRuns)
    .innerJoin(probes, eq(probes.id, calibrationRuns.probeId))
    .innerJoin(tanks, eq(tanks.id, calibrationRuns.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .leftJoin(users, eq(users.id, calibrationRuns.startedBy))
    .where(and(eq(sites.orgId, orgId), q.site ? eq(sites.id, q.site) : undefined, gte(calibrationRuns.startedAt, q.from), lt(calibrationRuns.startedAt, q.to)))
    .orderBy(asc(calibrationRuns.startedAt));
  const points = await db
    .select({ runId: calibrationPoints.runId, purpose: calibrationPoints.purpose, standard: calibrationPoints.standard, lot: calibrationPoints.lot })
    .from(calibrationPoints)
    .innerJoin(calibrationRuns, eq(calibrationRuns.id, calibrationPoints.runId))
    .innerJoin(tanks, eq(tanks.id, calibrationRuns.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(sites.orgId, orgId), q.site ? eq(sites.id, q.site) : undefined, gte(calibrationRuns.startedAt, q.from), lt(calibrationRuns.startedAt, q.to)))
    .orderBy(asc(calibrationPoints.runId), asc(calibrationPoints.seq));
  const iso = (ms: number | null) => (ms === null ? "" : new Date(ms).toISOString());
  const rows = runs.map(({ run, serial, kind, tankName, siteName, by }) => [
    run.id, siteName, tankName, serial, kind, run.status, run.source, iso(run.startedAt), iso(run.completedAt), iso(run.effectiveAt),
    run.slopePct ?? "", run.offsetMv ?? "", run.cellConstant ?? "", run.deviationPct ?? "", run.asFoundErrorPh ?? "", run.reasons.join(" "),
    points.filter((p) => p.runId === run.id).map((p) => `${p.purpose === "as_found" ? "as-found " : ""}${p.standard}${p.lot ? ` lot ${p.lot}` : ""}`).join("; "),
    by ?? "", run.note ?? "",
  ]);
  return csvTable(CALIBRATION_COLUMNS, rows);
}
