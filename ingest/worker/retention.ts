// Raw readings older than RAW_RETENTION_DAYS are deleted; rollups are kept. Deleted probe by
// probe along the (probe_id, ts) primary key, in small chunks, so no statement scans the
// whole table or holds the write lock for long. The cut is on a minute boundary, so the
// minutes that keep raw rows keep all of them (recomputeFrom rebuilds rollups from raw).
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";
import { minuteOf } from "./rollups";

const CHUNK = 5000;
const DAY_MS = 86_400_000;

export async function deleteExpiredReadings(db: DbClient, retentionDays: number, now = Date.now()): Promise<number> {
  const cutoff = minuteOf(now - retentionDays * DAY_MS);
  const probes = await db.execute("SELECT id FROM probes");
  let deleted = 0;
  for (const r of probes.rows) {
    const probeId = z.number().int().parse(r.id);
    for (;;) {
      const rs = await db.execute({
        sql: "DELETE FROM readings WHERE rowid IN (SELECT rowid FROM readings WHERE probe_id = ? AND ts < ? LIMIT ?)",
        args: [probeId, cutoff, CHUNK],
      });
      deleted += rs.rowsAffected;
      if (rs.rowsAffected < CHUNK) break;
      await new Promise((resolve) => setImmediate(resolve)); // let the ingest flush in between
    }
  }
  return deleted;
}
