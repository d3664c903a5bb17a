// Downsampled history of one tank for charts and sparklines: min, max and mean per time bucket,
// folded in SQL and finished by the pure bucketing in lib/display/downsample. The resolution
// read follows the range: raw readings for buckets under a minute, minute rollups up to
// HOURLY_FROM_MS, hourly rollups beyond (a 30-day view reads 720 rows per probe, a year 8,760),
// with finer sources for the newest part that the coarser ones do not cover yet.
import { and, eq, gte, inArray, isNotNull, isNull, lt, lte, or, sql, type SQL } from "drizzle-orm";
import type { Db } from "@/db/client";
import { calibrationRuns, holds, probes, sites, tanks, type ProbeKind } from "@/db/schema";
import { bucketPlan, emptyBuckets, foldIntoBuckets, type BucketPlan, type Buckets, type Partial } from "@/lib/display/downsample";

/** The newest minutes come from raw readings: the current minute's rollup is still filling. */
const RAW_TAIL_MS = 5 * 60_000;
const MINUTE = 60_000;
const HOUR = 3_600_000;
/** Ranges longer than this read hourly rollups (14 days of minutes is 20,160 rows per probe). */
export const HOURLY_FROM_MS = 14 * 86_400_000;

export interface TankSeries {
  tankId: number;
  from: number;
  to: number;
  bucketMs: number;
  source: "readings" | "rollups" | "hourly-rollups";
  band: { ph: [number, number]; ec: [number, number]; temp: [number, number] };
  series: Record<ProbeKind, Buckets>;
  holds: { id: number; placedAt: number; endAt: number | null; plannedEndAt: number; reason: string }[];
  calibrations: { id: number; kind: ProbeKind; at: number; status: string }[];
}

/** The tank of this organisation, or null. */
async function scopedTank(db: Db, orgId: number, tankId: number) {
  const [row] = await db
    .select({ tank: tanks })
    .from(tanks)
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(tanks.id, tankId), eq(sites.orgId, orgId)));
  return row?.tank ?? null;
}

// The client binds JS numbers as REAL: without the cast the division is not an integer one and
// every row becomes a group of its own (tens of thousands of groups instead of ~2,000).
const int = (n: number) => sql`CAST(${n} AS INTEGER)`;

const WORST = sql`max(CASE quality WHEN 'ok' THEN 0 WHEN 'held' THEN 1 WHEN 'uncalibrated' THEN 2 WHEN 'lapsed' THEN 3 ELSE 4 END)`;

/**
 * The rows of `query` as arrays of numbers, fetched as one JSON value: the driver hands rows over
 * one at a time at several microseconds each, and a chart's 700–1,500 of them cost more than the
 * query; SQLite builds the JSON in C and JSON.parse reads it at once. (REALs come back with 15
 * significant digits, far more than a chart shows.)
 */
async function numberRows(db: Db, query: SQL, columns: SQL): Promise<(number | null)[][]> {
  const [row] = await db.all<{ j: string }>(sql`SELECT json_group_array(json_array(${columns})) AS j FROM (${query})`);
  return JSON.parse(row.j) as (number | null)[][];
}

async function rawPartials(db: Db, probeIds: number[], plan: BucketPlan, from: number, to: number): Promise<Partial[]> {
  if (!probeIds.length || to <= from) return [];
  const rows = await numberRows(
    db,
    sql`
    SELECT (ts - ${int(plan.start)}) / ${int(plan.bucketMs)} AS b, min(value) AS mn, max(value) AS mx, sum(value) AS s, count(value) AS n, ${WORST} AS w
    FROM readings
    WHERE probe_id IN (${sql.join(probeIds, sql`, `)}) AND ts >= ${from} AND ts < ${to} AND value IS NOT NULL
    GROUP BY b`,
    sql.raw("b, mn, mx, s, n, w"),
  );
  return rows.map(([b, mn, mx, s, n, w]) => ({ t: plan.start + b! * plan.bucketMs, min: mn!, max: mx!, sum: s!, count: n!, worst: w }));
}

async function rollupPartials(db: Db, probeIds: number[], plan: BucketPlan, from: number, to: number, table: "rollups" | "hourly"): Promise<Partial[]> {
  if (!probeIds.length || to <= from) return [];
  const [name, column, rowMs] = table === "rollups" ? [sql.raw("rollups"), sql.raw("minute"), MINUTE] : [sql.raw("rollups_hourly"), sql.raw("hour"), HOUR];
  const where = sql`probe_id IN (${sql.join(probeIds, sql`, `)}) AND ${column} >= ${from} AND ${column} < ${to}`;
  // Rollups carry no quality flags; the chart marks holds and calibrations instead.
  if (plan.bucketMs <= rowMs) {
    // A bucket no wider than a row (a 30-day view of hourly rows): the rows are read as they are
    // and folded by foldIntoBuckets; SQL's GROUP BY would sort them for nothing.
    const rows = await numberRows(db, sql`SELECT ${column} AS t, min, max, sum, count FROM ${name} WHERE ${where}`, sql.raw("t, min, max, sum, count"));
    return rows.map(([t, mn, mx, s, n]) => ({ t: t!, min: mn!, max: mx!, sum: s!, count: n!, worst: null }));
  }
  const rows = await numberRows(
    db,
    sql`
    SELECT (${column} - ${int(plan.start)}) / ${int(plan.bucketMs)} AS b, min(min) AS mn, max(max) AS mx, sum(sum) AS s, sum(count) AS n
    FROM ${name}
    WHERE ${where}
    GROUP BY b`,
    sql.raw("b, mn, mx, s, n"),
  );
  return rows.map(([b, mn, mx, s, n]) => ({ t: plan.start + b! * plan.bucketMs, min: mn!, max: mx!, sum: s!, count: n!, worst: null }));
}

/** Series of one tank over [from, to) in at most `points` buckets; null when the tank is not the organisation's. */
export async function loadTankSeries(db: Db, orgId: number, tankId: number, from: number, to: number, points: number): Promise<TankSeries | null> {
  const tank = await scopedTank(db, orgId, tankId);
  if (!tank) return null;
  const useHourly = to - from > HOURLY_FROM_MS;
  // Hourly rows fill hour-wide (or wider) buckets: no more buckets than hours in the range.
  const plan = bucketPlan(from, to, useHourly ? Math.max(1, Math.min(points, Math.floor((to - from) / HOUR))) : points);
  const probeRows = await db.select({ id: probes.id, kind: probes.kind }).from(probes).where(eq(probes.tankId, tankId));
  const useRollups = plan.bucketMs >= MINUTE;
  const rawFrom = useRollups ? Math.max(plan.start, Math.floor((to - RAW_TAIL_MS) / MINUTE) * MINUTE) : Math.max(from, plan.start);
  // Whole hours before the raw tail come from hourly rollups, the minutes between from minute ones.
  const minuteFrom = useHourly ? Math.max(plan.start, Math.floor(rawFrom / HOUR) * HOUR) : plan.start;

  const series = {} as Record<ProbeKind, Buckets>;
  await Promise.all(
    (["ph", "ec", "temp"] as const).map(async (kind) => {
      const ids = probeRows.filter((p) => p.kind === kind).map((p) => p.id);
      if (!ids.length) {
        series[kind] = emptyBuckets(plan.bucketMs);
        return;
      }
      const [oldest, older, recent] = await Promise.all([
        useHourly ? rollupPartials(db, ids, plan, plan.start, minuteFrom, "hourly") : Promise.resolve([]),
        useRollups ? rollupPartials(db, ids, plan, minuteFrom, rawFrom, "rollups") : Promise.resolve([]),
        rawPartials(db, ids, plan, rawFrom, to),
      ]);
      series[kind] = foldIntoBuckets([...oldest, ...older, ...recent], plan);
    }),
  );

  const probeKind = new Map(probeRows.map((p) => [p.id, p.kind]));
  const [holdRows, runRows] = await Promise.all([
    db
      .select()
      .from(holds)
      .where(and(eq(holds.tankId, tankId), lt(holds.placedAt, to), or(isNull(holds.releasedAt), gte(holds.releasedAt, from)))),
    probeRows.length
      ? db
          .select({ id: calibrationRuns.id, probeId: calibrationRuns.probeId, completedAt: calibrationRuns.completedAt, status: calibrationRuns.status })
          .from(calibrationRuns)
          .where(
            and(
              inArray(
                calibrationRuns.probeId,
                probeRows.map((p) => p.id),
              ),
              isNotNull(calibrationRuns.completedAt),
              gte(calibrationRuns.completedAt, from),
              lte(calibrationRuns.completedAt, to),
            ),
          )
      : Promise.resolve([]),
  ]);

  return {
    tankId,
    from,
    to,
    bucketMs: plan.bucketMs,
    source: useHourly ? "hourly-rollups" : useRollups ? "rollups" : "readings",
    band: { ph: [tank.phMin, tank.phMax], ec: [tank.ecMinUs, tank.ecMaxUs], temp: [tank.tempMin, tank.tempMax] },
    series,
    holds: holdRows.map((h) => ({ id: h.id, placedAt: h.placedAt, endAt: h.releasedAt, plannedEndAt: h.plannedEndAt, reason: h.reason })),
    calibrations: runRows.map((r) => ({ id: r.id, kind: probeKind.get(r.probeId) ?? "ph", at: r.completedAt!, status: r.status })),
  };
}
