// The alert runner when several ingest workers share one broker subscription: one elected runner
// for all of them, fed from the database in commit order.
//
// With a shared subscription the broker hands each raw message to any worker, so every worker
// sees a slice of every tank; a runner per worker would judge half the readings and raise the
// same incident twice. Instead the workers compete for one lease row (`leases`, name "alerts");
// the holder renews it every LEASE_MS / 3 and runs the alert runner over every committed row
// of every worker, read from `readings` by rowid (SQLite serialises writers, so rowids grow in
// commit order), and stores how far it got in the lease row. If the holder dies, another worker
// takes the lease once it expires and carries on from that cursor with a fresh runner (the
// engine's state is persisted per batch, so a takeover re-judges at most one batch and never
// fires twice). Non-holders only keep trying for the lease.
import { sql } from "drizzle-orm";
import { z } from "zod";
import type { Db } from "../../db/client";
import { PROBE_KINDS, QUALITY_FLAGS } from "../../db/schema";
import type { AlertsHandle } from "./wire";
import { createAlertRunner, type AlertRunner } from "./runner";
import { PackedReadingsBuilder } from "../packed-readings";
import type { Publish } from "./publish";

const LEASE_NAME = "alerts";
const PAGE_ROWS = 5000;

export interface ElectedAlertsOptions {
  db: Db;
  publish: Publish;
  /** Unique per process: the lease names who holds it. */
  holder: string;
  leaseMs?: number;
  pollMs?: number;
  tickMs?: number;
  resolveAfterMs?: number;
  log?: (message: string, err?: unknown) => void;
}

const leaseRow = z.object({ holder: z.string(), cursor: z.number().int() });
const probeRow = z.object({ id: z.number().int(), kind: z.enum(PROBE_KINDS), tank_id: z.number().int(), org_id: z.number().int() });
const readingRow = z.object({
  rowid: z.number().int(),
  probe_id: z.number().int(),
  ts: z.number().int(),
  raw: z.number(),
  value: z.number().nullable(),
  quality: z.enum(QUALITY_FLAGS),
});

/** Takes the lease if it is free, expired or already ours; returns its cursor when we hold it. */
export async function acquireLease(db: Db, name: string, holder: string, leaseMs: number, now = Date.now()): Promise<number | null> {
  const rows = await db.all(sql`
    INSERT INTO leases (name, holder, expires_at, cursor)
    VALUES (${name}, ${holder}, ${now + leaseMs}, (SELECT coalesce(max(rowid), 0) FROM readings))
    ON CONFLICT(name) DO UPDATE SET holder = excluded.holder, expires_at = excluded.expires_at
      WHERE leases.holder = excluded.holder OR leases.expires_at < ${now}
    RETURNING holder, cursor`);
  const row = rows.length ? leaseRow.parse(rows[0]) : null;
  return row && row.holder === holder ? row.cursor : null;
}

export function startElectedAlerts(o: ElectedAlertsOptions): AlertsHandle & { isLeader(): boolean } {
  const { db } = o;
  const leaseMs = o.leaseMs ?? 10_000;
  const pollMs = o.pollMs ?? 200;
  const tickMs = o.tickMs ?? 30_000;
  const log = o.log ?? ((m: string, err?: unknown) => console.error(`[alerts] ${m}`, err ?? ""));
  let runner: AlertRunner | null = null;
  let cursor = 0;
  let leaseUntil = 0;
  let lastTick = 0;
  let stopped = false;
  let timer: NodeJS.Timeout | null = null;
  const probes = new Map<number, z.infer<typeof probeRow>>();

  async function loadProbes() {
    const rows = z.array(probeRow).parse(await db.all(sql`SELECT p.id, p.kind, p.tank_id, s.org_id FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN sites s ON s.id = t.site_id`));
    probes.clear();
    for (const r of rows) probes.set(r.id, r);
  }

  /** Renews (or takes) the lease; a new holder starts a fresh runner from the stored cursor. */
  async function holdLease(now: number): Promise<boolean> {
    if (runner && now < leaseUntil - (leaseMs * 2) / 3) return true;
    const stored = await acquireLease(db, LEASE_NAME, o.holder, leaseMs, now);
    if (stored === null) {
      if (runner) log(`lost the alert lease; another ingest worker runs the alerts now`);
      runner = null;
      return false;
    }
    leaseUntil = now + leaseMs;
    if (!runner) {
      log(`holding the alert lease as ${o.holder}, from reading row ${stored}`);
      runner = createAlertRunner({ db, publish: o.publish, resolveAfterMs: o.resolveAfterMs, log });
      cursor = stored;
      lastTick = 0;
      await loadProbes();
    }
    return true;
  }

  /** Feeds the runner every row committed since the cursor, a page at a time. */
  async function drain(r: AlertRunner) {
    for (;;) {
      // Renewed before every page: a long catch-up never outlives the lease, so no other worker
      // can have taken it over while this one still evaluates.
      if (!(await holdLease(Date.now())) || runner !== r) return;
      const rows = z
        .array(readingRow)
        .parse(await db.all(sql`SELECT rowid, probe_id, ts, raw, value, quality FROM readings WHERE rowid > ${cursor} ORDER BY rowid LIMIT ${PAGE_ROWS}`));
      if (rows.length === 0) return;
      if (rows.some((row) => !probes.has(row.probe_id))) await loadProbes();
      const readings = new PackedReadingsBuilder();
      for (const row of rows) {
        const p = probes.get(row.probe_id);
        if (p) readings.push(p.org_id, p.tank_id, p.id, p.kind, row.ts, row.raw, row.value, row.quality, null);
      }
      await r.onReadings(readings.take());
      cursor = rows[rows.length - 1].rowid;
      await db.run(sql`UPDATE leases SET cursor = ${cursor} WHERE name = ${LEASE_NAME} AND holder = ${o.holder}`);
      if (rows.length < PAGE_ROWS) return;
    }
  }

  async function step() {
    const now = Date.now();
    if (!(await holdLease(now)) || !runner) return;
    await drain(runner);
    if (now - lastTick >= tickMs) {
      lastTick = now;
      await runner.tick(now);
    }
  }

  const loop = () => {
    if (stopped) return;
    step()
      .catch((err: unknown) => log("elected alert runner step failed", err))
      .finally(() => {
        if (!stopped) timer = setTimeout(loop, pollMs);
      });
  };
  loop();

  return {
    // Batches reach the runner through the database, whichever worker committed them.
    onReadingsCommitted: async () => undefined,
    stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      // Hand over at once rather than after the lease expires.
      if (runner) void db.run(sql`UPDATE leases SET expires_at = 0 WHERE name = ${LEASE_NAME} AND holder = ${o.holder}`).catch(() => undefined);
    },
    isLeader: () => runner !== null,
  };
}
