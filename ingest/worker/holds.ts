// Holds that can still affect incoming readings: open ones, and those released in the last
// week (a device flushing old samples after an outage must still see them as held).
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";

const holdRow = z.object({
  id: z.number().int(),
  tank_id: z.number().int(),
  probe_id: z.number().int().nullable(),
  placed_at: z.number().int(),
  released_at: z.number().int().nullable(),
});

export interface HoldSpan {
  id: number;
  tankId: number;
  /** null: the whole tank is on hold. */
  probeId: number | null;
  placedAt: number;
  releasedAt: number | null;
}

const LOOKBACK_MS = 7 * 86_400_000;

/** True when a hold on the tank (or on that probe) covers `ts`. A hold lasts until released. */
export function isHeld(holds: readonly HoldSpan[] | undefined, probeId: number, ts: number): boolean {
  if (!holds) return false;
  for (const h of holds) {
    if ((h.probeId === null || h.probeId === probeId) && ts >= h.placedAt && (h.releasedAt === null || ts < h.releasedAt)) return true;
  }
  return false;
}

export function groupHolds(rows: unknown[]): Map<number, HoldSpan[]> {
  const byTank = new Map<number, HoldSpan[]>();
  for (const r of rows) {
    const h = holdRow.parse(r);
    const list = byTank.get(h.tank_id) ?? [];
    list.push({ id: h.id, tankId: h.tank_id, probeId: h.probe_id, placedAt: h.placed_at, releasedAt: h.released_at });
    byTank.set(h.tank_id, list);
  }
  return byTank;
}

export class HoldBook {
  constructor(
    private readonly db: DbClient,
    public byTank: Map<number, HoldSpan[]>,
  ) {}

  static async open(db: DbClient): Promise<HoldBook> {
    const book = new HoldBook(db, new Map());
    await book.refresh();
    return book;
  }

  held(tankId: number, probeId: number, ts: number): boolean {
    return isHeld(this.byTank.get(tankId), probeId, ts);
  }

  /** Re-reads the holds; resolves with the tanks whose holds changed (tank id → earliest time). */
  async refresh(now = Date.now()): Promise<Map<number, number>> {
    const rs = await this.db.execute({
      sql: "SELECT id, tank_id, probe_id, placed_at, released_at FROM holds WHERE released_at IS NULL OR released_at > ?",
      args: [now - LOOKBACK_MS],
    });
    const next = groupHolds(rs.rows);
    const changed = diffHolds(this.byTank, next);
    this.byTank = next;
    return changed;
  }
}

/**
 * Tanks whose holds changed between two loads, with the earliest time whose readings change
 * flag: a new hold from its placement, a release from its release.
 */
export function diffHolds(before: Map<number, HoldSpan[]>, after: Map<number, HoldSpan[]>): Map<number, number> {
  const changed = new Map<number, number>();
  const key = (h: HoldSpan) => `${h.id}:${h.probeId}:${h.placedAt}:${h.releasedAt}`;
  for (const [tankId, list] of after) {
    const old = before.get(tankId) ?? [];
    const oldKeys = new Set(old.map(key));
    const oldIds = new Set(old.map((h) => h.id));
    for (const h of list) {
      if (oldKeys.has(key(h))) continue;
      const at = oldIds.has(h.id) ? (h.releasedAt ?? h.placedAt) : h.placedAt;
      changed.set(tankId, Math.min(changed.get(tankId) ?? Infinity, at));
    }
  }
  return changed;
}
