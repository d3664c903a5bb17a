// One-minute rollups (min, max, sum, count of the corrected value per probe), aggregated in
// memory per batch and merged into the table with an upsert. Rows without a value are skipped.
export const MINUTE_MS = 60_000;

export interface RollupDelta {
  probeId: number;
  minute: number;
  min: number;
  max: number;
  sum: number;
  count: number;
}

export function minuteOf(ts: number): number {
  return Math.floor(ts / MINUTE_MS) * MINUTE_MS;
}

export function aggregateRollups(rows: Iterable<{ probeId: number; ts: number; value: number | null }>): RollupDelta[] {
  const byKey = new Map<string, RollupDelta>();
  for (const r of rows) {
    if (r.value === null) continue;
    const minute = minuteOf(r.ts);
    const k = `${r.probeId}:${minute}`;
    const d = byKey.get(k);
    if (d) {
      if (r.value < d.min) d.min = r.value;
      if (r.value > d.max) d.max = r.value;
      d.sum += r.value;
      d.count++;
    } else {
      byKey.set(k, { probeId: r.probeId, minute, min: r.value, max: r.value, sum: r.value, count: 1 });
    }
  }
  return [...byKey.values()];
}

/** Upsert of rollup deltas (6 parameters per row) into existing minutes. */
export function rollupUpsertSql(n: number): string {
  return `INSERT INTO rollups (probe_id, minute, min, max, sum, count) VALUES ${Array(n).fill("(?,?,?,?,?,?)").join(",")}
    ON CONFLICT(probe_id, minute) DO UPDATE SET
      min = min(rollups.min, excluded.min), max = max(rollups.max, excluded.max),
      sum = rollups.sum + excluded.sum, count = rollups.count + excluded.count`;
}
