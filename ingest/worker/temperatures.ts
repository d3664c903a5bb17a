// The latest solution temperatures per tank, for temperature compensation of pH and EC.
// A short history is kept so a late sample is compensated with the temperature of its time.
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";
import { PHYSICAL_RANGES } from "../../lib/alerts/ranges";

const KEEP = 64; // samples of history kept per tank, at least

interface Point {
  ts: number;
  value: number;
}

export class TankTemperatures {
  private byTank = new Map<number, Point[]>();

  /** Records a temperature sample (callers pass only physically possible ones). */
  record(tankId: number, ts: number, value: number): void {
    const list = this.byTank.get(tankId) ?? [];
    // Kept in time order; samples nearly always arrive in order, so this is a push.
    let i = list.length;
    while (i > 0 && list[i - 1].ts > ts) i--;
    if (i > 0 && list[i - 1].ts === ts) list[i - 1] = { ts, value };
    else list.splice(i, 0, { ts, value });
    // Trimmed a KEEP at a time, not one sample at a time: that moved the whole list for every sample.
    if (list.length > 2 * KEEP) list.splice(0, list.length - KEEP);
    this.byTank.set(tankId, list);
  }

  /** The temperature at or before `ts` (else the oldest known), or null when none is known. */
  at(tankId: number, ts: number): number | null {
    const list = this.byTank.get(tankId);
    if (!list || list.length === 0) return null;
    for (let i = list.length - 1; i >= 0; i--) if (list[i].ts <= ts) return list[i].value;
    return list[0].value;
  }

  /** Seeds each tank with its last stored, physically possible temperature reading. */
  async load(db: DbClient): Promise<void> {
    const probes = await db.execute("SELECT id, tank_id FROM probes WHERE kind = 'temp'");
    const probe = z.object({ id: z.number().int(), tank_id: z.number().int() });
    const point = z.object({ ts: z.number().int(), value: z.number() });
    for (const r of probes.rows) {
      const p = probe.parse(r);
      // Walks the (probe_id, ts) primary key backwards: cheap however long the history.
      const rs = await db.execute({
        sql: "SELECT ts, value FROM readings WHERE probe_id = ? AND value BETWEEN ? AND ? ORDER BY ts DESC LIMIT 1",
        args: [p.id, PHYSICAL_RANGES.temp.min, PHYSICAL_RANGES.temp.max],
      });
      if (rs.rows.length) {
        const t = point.parse(rs.rows[0]);
        this.record(p.tank_id, t.ts, t.value);
      }
    }
  }
}
