// Readings a reconnecting client missed, read back from the database so nothing is lost across a
// dropped connection. Bounded: at most the wall's trend window, at most MAX_ROWS rows (newest kept).
import { sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import type { QualityFlag } from "@/db/schema";
import type { StreamScope } from "./scope";

export const BACKFILL_WINDOW_MS = 30 * 60_000;
export const BACKFILL_MAX_ROWS = 20_000;

export interface StreamReading {
  probeId: number;
  kind: "ph" | "ec" | "temp";
  ts: number;
  value: number | null;
  quality: QualityFlag;
}

export interface Backfill {
  byTank: Map<number, StreamReading[]>;
  /** Some readings were older than the window or over the row cap: the client refetches instead. */
  truncated: boolean;
  rows: number;
}

export async function readingsSince(db: Db, scope: StreamScope, since: number, now = Date.now()): Promise<Backfill> {
  const byTank = new Map<number, StreamReading[]>();
  const probeIds = [...scope.probes.keys()];
  const from = Math.max(since, now - BACKFILL_WINDOW_MS);
  if (!probeIds.length) return { byTank, truncated: since < from, rows: 0 };
  const rows = await db.all<{ probe_id: number; ts: number; value: number | null; quality: QualityFlag }>(sql`
    SELECT probe_id, ts, value, quality FROM readings
    WHERE probe_id IN (${sql.join(probeIds, sql`, `)}) AND ts > ${from}
    ORDER BY ts DESC LIMIT ${BACKFILL_MAX_ROWS + 1}`);
  const truncated = since < from || rows.length > BACKFILL_MAX_ROWS;
  const kept = rows.slice(0, BACKFILL_MAX_ROWS).reverse();
  for (const r of kept) {
    const probe = scope.probes.get(r.probe_id);
    if (!probe) continue;
    const list = byTank.get(probe.tankId) ?? [];
    list.push({ probeId: r.probe_id, kind: probe.kind, ts: r.ts, value: r.value, quality: r.quality });
    byTank.set(probe.tankId, list);
  }
  return { byTank, truncated, rows: kept.length };
}
