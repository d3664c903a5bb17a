// recomputeFrom: after a calibration is saved (or withdrawn) with an effective time in the
// past, every stored reading of the probe from that time on is corrected again from its raw
// signal, exactly as the ingest would correct it now, and the rollups of those minutes (and
// hours) are rebuilt from the raw rows. Safe to run while the ingest writes: each page and each rollup
// range is its own transaction, and a rebuilt minute includes every row committed before it.
import { sql } from "drizzle-orm";
import { z } from "zod";
import type { Db } from "../db/client";
import { PROBE_KINDS, QUALITY_FLAGS } from "../db/schema";
import { ACCEPTED_RUNS_SQL, buildRuns, runInForce } from "./worker/calibrations";
import { PHYSICAL_RANGES } from "../lib/alerts/ranges";
import { correct } from "./worker/correct";
import { groupHolds, isHeld } from "./worker/holds";
import { HOUR_MS, hourOf, MINUTE_MS, minuteOf } from "./worker/rollups";

const PAGE = 2000;
// Only physically possible temperatures compensate pH and EC (as in the live ingest).
const TEMP = PHYSICAL_RANGES.temp;
const UPDATE_CHUNK = 400; // 4 parameters a row
const ROLLUP_SPAN_MS = 6 * 3_600_000; // rollups are rebuilt six whole hours per transaction

// Inlined, not bound: the client binds JS numbers as REAL, which would make the division fractional.
const MINUTE = sql.raw(String(MINUTE_MS));
const HOUR = sql.raw(String(HOUR_MS));

const probeRow = z.object({
  id: z.number().int(),
  kind: z.enum(PROBE_KINDS),
  tank_id: z.number().int(),
  nominal_cell_constant: z.number().nullable(),
  alpha: z.number(),
  interval_days: z.number(),
});
const readingRow = z.object({
  ts: z.number().int(),
  raw: z.number(),
  value: z.number().nullable(),
  quality: z.enum(QUALITY_FLAGS),
  calibration_run_id: z.number().int().nullable(),
});
const tempRow = z.object({ ts: z.number().int(), value: z.number() });

export interface RecomputeResult {
  /** Readings looked at (ts ≥ fromTs). */
  scanned: number;
  /** Readings whose value, quality or calibration changed. */
  updated: number;
  /** One-minute rollups rebuilt. */
  rollupMinutes: number;
}

export async function recomputeFrom(db: Db, probeId: number, fromTs: number): Promise<RecomputeResult> {
  const found = await db.all(sql`
    SELECT p.id, p.kind, p.tank_id, p.nominal_cell_constant, t.ec_alpha_per_c AS alpha,
           min(t.calibration_interval_days, s.max_calibration_interval_days) AS interval_days
      FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN sites s ON s.id = t.site_id
     WHERE p.id = ${probeId}`);
  if (found.length === 0) throw new Error(`recomputeFrom: no probe ${probeId}`);
  const probe = probeRow.parse(found[0]);
  const runs = buildRuns(await db.all(sql`${sql.raw(ACCEPTED_RUNS_SQL)} AND probe_id = ${probeId}`)).get(probeId);
  const holds = groupHolds(
    await db.all(sql`SELECT id, tank_id, probe_id, placed_at, released_at FROM holds
                      WHERE tank_id = ${probe.tank_id} AND (released_at IS NULL OR released_at > ${fromTs})`),
  ).get(probe.tank_id);
  const tempProbes = z
    .array(z.object({ id: z.number().int() }))
    .parse(await db.all(sql`SELECT id FROM probes WHERE tank_id = ${probe.tank_id} AND kind = 'temp'`))
    .map((r) => r.id);

  let scanned = 0;
  let updated = 0;
  let cursor = fromTs;
  let inclusive = true;
  for (;;) {
    const page = z.array(readingRow).parse(
      await db.all(sql`SELECT ts, raw, value, quality, calibration_run_id FROM readings
                        WHERE probe_id = ${probeId} AND ts ${sql.raw(inclusive ? ">=" : ">")} ${cursor}
                        ORDER BY ts LIMIT ${PAGE}`),
    );
    if (page.length === 0) break;
    scanned += page.length;
    const temps = probe.kind === "temp" ? [] : await temperaturesFor(db, tempProbes, page[0].ts, page[page.length - 1].ts);
    const changes: { ts: number; value: number | null; quality: string; run: number | null }[] = [];
    let ti = 0;
    for (const r of page) {
      while (ti + 1 < temps.length && temps[ti + 1].ts <= r.ts) ti++;
      const tempC = temps.length ? temps[ti].value : null; // at or before r.ts, else the oldest known
      const c = correct({
        kind: probe.kind,
        raw: r.raw,
        ts: r.ts,
        tempC,
        calibration: probe.kind === "temp" ? null : runInForce(runs, r.ts),
        nominalCellConstant: probe.nominal_cell_constant,
        alphaPerC: probe.alpha,
        intervalDays: probe.interval_days,
        held: isHeld(holds, probeId, r.ts),
      });
      if (c.value !== r.value || c.quality !== r.quality || c.calibrationRunId !== r.calibration_run_id) {
        changes.push({ ts: r.ts, value: c.value, quality: c.quality, run: c.calibrationRunId });
      }
    }
    if (changes.length) {
      await db.transaction(async (tx) => {
        for (let i = 0; i < changes.length; i += UPDATE_CHUNK) {
          const values = sql.join(
            changes.slice(i, i + UPDATE_CHUNK).map((c) => sql`(${c.ts}, ${c.value}, ${c.quality}, ${c.run})`),
            sql`, `,
          );
          await tx.run(sql`WITH v(ts, value, quality, run) AS (VALUES ${values})
            UPDATE readings SET value = v.value, quality = v.quality, calibration_run_id = v.run
              FROM v WHERE readings.probe_id = ${probeId} AND readings.ts = v.ts`);
        }
      });
      updated += changes.length;
    }
    cursor = page[page.length - 1].ts;
    inclusive = false;
    if (page.length < PAGE) break;
  }

  const rollupMinutes = await rebuildRollups(db, probeId, fromTs);
  return { scanned, updated, rollupMinutes };
}

/** Temperatures covering [from, to]: the last one at or before `from`, then all up to `to`. */
async function temperaturesFor(db: Db, probeIds: number[], from: number, to: number): Promise<{ ts: number; value: number }[]> {
  if (probeIds.length === 0) return [];
  let start = from;
  for (const id of probeIds) {
    const before = z.array(tempRow).parse(
      await db.all(sql`SELECT ts, value FROM readings WHERE probe_id = ${id} AND ts <= ${from}
                        AND value BETWEEN ${TEMP.min} AND ${TEMP.max} ORDER BY ts DESC LIMIT 1`),
    );
    if (before.length) start = Math.min(start, before[0].ts);
  }
  const ids = sql.join(probeIds.map((id) => sql`${id}`), sql`, `);
  return z.array(tempRow).parse(
    await db.all(sql`SELECT ts, value FROM readings WHERE probe_id IN (${ids}) AND ts >= ${start} AND ts <= ${to}
                      AND value BETWEEN ${TEMP.min} AND ${TEMP.max} ORDER BY ts`),
  );
}

/**
 * Rebuilds the probe's rollups from raw rows, from the minute of `fromTs` (or of the first raw
 * row after it, where retention already removed older raw rows: those rollups are kept as they are).
 * Spans are whole hours, and each span's hourly rollups are rebuilt from its minute rollups in
 * the same transaction, so the two resolutions always agree.
 */
async function rebuildRollups(db: Db, probeId: number, fromTs: number): Promise<number> {
  const first = z
    .object({ first: z.number().int().nullable(), last: z.number().int().nullable() })
    .parse(await db.get(sql`SELECT min(ts) AS first, max(ts) AS last FROM readings WHERE probe_id = ${probeId} AND ts >= ${minuteOf(fromTs)}`));
  if (first.first === null || first.last === null) return 0;
  let minutes = 0;
  const end = hourOf(first.last) + HOUR_MS;
  const start = minuteOf(first.first);
  for (let from = start; from < end; from = hourOf(from) + ROLLUP_SPAN_MS) {
    const to = Math.min(end, hourOf(from) + ROLLUP_SPAN_MS);
    const last = to >= end; // the open end also takes rows committed while we worked
    await db.transaction(async (tx) => {
      const upper = last ? sql`` : sql`AND minute < ${to}`;
      const upperTs = last ? sql`` : sql`AND ts < ${to}`;
      await tx.run(sql`DELETE FROM rollups WHERE probe_id = ${probeId} AND minute >= ${from} ${upper}`);
      const rs = await tx.run(sql`INSERT INTO rollups (probe_id, minute, min, max, sum, count)
        SELECT probe_id, (ts / ${MINUTE}) * ${MINUTE}, min(value), max(value), sum(value), count(value)
          FROM readings WHERE probe_id = ${probeId} AND ts >= ${from} ${upperTs} AND value IS NOT NULL
         GROUP BY probe_id, (ts / ${MINUTE})`);
      minutes += rs.rowsAffected;
      // The hours this span touches, whole (an hour's older minutes are kept rollups).
      const hourFrom = hourOf(from);
      const upperHour = last ? sql`` : sql`AND hour < ${to}`;
      const upperMinute = last ? sql`` : sql`AND minute < ${to}`;
      await tx.run(sql`DELETE FROM rollups_hourly WHERE probe_id = ${probeId} AND hour >= ${hourFrom} ${upperHour}`);
      await tx.run(sql`INSERT INTO rollups_hourly (probe_id, hour, min, max, sum, count)
        SELECT probe_id, (minute / ${HOUR}) * ${HOUR}, min(min), max(max), sum(sum), sum(count)
          FROM rollups WHERE probe_id = ${probeId} AND minute >= ${hourFrom} ${upperMinute}
         GROUP BY probe_id, (minute / ${HOUR})`);
    });
  }
  return minutes;
}
