// Persisted engine state (`alert_state`): "probe:<id>" and "tank:<id>" hold lib/alerts state,
// "digest:site:<id>" the local day of the last morning digest.
import { inArray, sql } from "drizzle-orm";
import type { Db } from "../../db/client";
import { alertState } from "../../db/schema";

export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export const probeKey = (id: number) => `probe:${id}`;
export const tankKey = (id: number) => `tank:${id}`;
export const digestKey = (siteId: number) => `digest:site:${siteId}`;

export async function readStates(db: Db, keys: string[]): Promise<Map<string, unknown>> {
  const out = new Map<string, unknown>();
  for (let i = 0; i < keys.length; i += 500) {
    const rows = await db.select().from(alertState).where(inArray(alertState.key, keys.slice(i, i + 500)));
    for (const r of rows) out.set(r.key, r.state);
  }
  return out;
}

export async function writeStates(tx: Tx, entries: [string, unknown][], now: number): Promise<void> {
  if (entries.length === 0) return;
  for (let i = 0; i < entries.length; i += 200) {
    await tx
      .insert(alertState)
      .values(entries.slice(i, i + 200).map(([key, state]) => ({ key, state, updatedAt: now })))
      .onConflictDoUpdate({ target: alertState.key, set: { state: sql`excluded.state`, updatedAt: sql`excluded.updated_at` } });
  }
}
