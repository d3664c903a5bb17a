// Rollups: min, max, sum and count of the corrected value per probe and minute (`rollups`) and
// per probe and hour (`rollups_hourly`), aggregated in memory per batch and merged into the
// tables with upserts in the batch's transaction. Rows without a value are skipped.
import type { PackedReadings } from "../packed-readings";

export const MINUTE_MS = 60_000;
export const HOUR_MS = 3_600_000;

export interface RollupDelta {
  probeId: number;
  /** Start of the minute (or hour) in ms epoch. */
  minute: number;
  min: number;
  max: number;
  sum: number;
  count: number;
}

export function minuteOf(ts: number): number {
  return Math.floor(ts / MINUTE_MS) * MINUTE_MS;
}

export function hourOf(ts: number): number {
  return Math.floor(ts / HOUR_MS) * HOUR_MS;
}

/**
 * One number per probe and minute (or hour) start, not a string built for every row: exact while
 * probe ids stay below 2^27 and minutes since 1970 below 2^26 (the year 2097).
 */
const keyOf = (probeId: number, start: number) => probeId * 67_108_864 + start / MINUTE_MS;

function merge(into: Map<number, RollupDelta>, probeId: number, start: number, min: number, max: number, sum: number, count: number) {
  const k = keyOf(probeId, start);
  const d = into.get(k);
  if (d) {
    if (min < d.min) d.min = min;
    if (max > d.max) d.max = max;
    d.sum += sum;
    d.count += count;
  } else {
    into.set(k, { probeId, minute: start, min, max, sum, count });
  }
}

/** The minute deltas of the rows whose flag is 1 (`isNew` null: of every row). */
export function aggregateRollups(rows: PackedReadings, isNew: Uint8Array | null = null): RollupDelta[] {
  const byKey = new Map<number, RollupDelta>();
  for (let i = 0; i < rows.length; i++) {
    const value = rows.value(i);
    if (value === null || (isNew !== null && !isNew[i])) continue;
    merge(byKey, rows.probeId(i), minuteOf(rows.ts(i)), value, value, value, 1);
  }
  return [...byKey.values()];
}

/** The hourly deltas of a batch's minute deltas (`minute` then holds the hour start). */
export function hourlyOf(minutes: readonly RollupDelta[]): RollupDelta[] {
  const byKey = new Map<number, RollupDelta>();
  for (const d of minutes) merge(byKey, d.probeId, hourOf(d.minute), d.min, d.max, d.sum, d.count);
  return [...byKey.values()];
}

const upsertSql = (table: "rollups" | "rollups_hourly", column: "minute" | "hour", n: number) =>
  `INSERT INTO ${table} (probe_id, ${column}, min, max, sum, count) VALUES ${Array(n).fill("(?,?,?,?,?,?)").join(",")}
    ON CONFLICT(probe_id, ${column}) DO UPDATE SET
      min = min(${table}.min, excluded.min), max = max(${table}.max, excluded.max),
      sum = ${table}.sum + excluded.sum, count = ${table}.count + excluded.count`;

/** Upsert of minute deltas (6 parameters per row). */
export function rollupUpsertSql(n: number): string {
  return upsertSql("rollups", "minute", n);
}

/** Upsert of hourly deltas (6 parameters per row). */
export function hourlyUpsertSql(n: number): string {
  return upsertSql("rollups_hourly", "hour", n);
}
