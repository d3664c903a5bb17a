// Recomputing stored readings when a calibration is saved with an effective time in the past
// (recomputeFrom, called by the web on save), and the live ingest picking up a calibration and
// a hold saved while it streams, correcting what it had already written with the old view.
import { describe, expect, it } from "vitest";
import type { Client } from "@libsql/client";
import { phFromMv } from "../../lib/calibration";
import { recomputeFrom } from "../../ingest/recompute";
import { topics } from "../../ingest/topics";
import type { OrgEvent } from "../../ingest/payloads";
import { connectMqtt, endMqtt, serviceLogin } from "./helpers/mqtt";
import { countReadingsSince, startBroker, startIngest, startSimulator } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep, waitFor } from "./helpers/wait";

const testDb = useTestDatabase({ label: "recompute" });

const DAY = 86_400_000;
const num = (v: unknown) => Number(v);

async function probeBySerial(c: Client, serial: string) {
  const rs = await c.execute({ sql: "SELECT id, tank_id FROM probes WHERE serial = ?", args: [serial] });
  return { id: num(rs.rows[0].id), tankId: num(rs.rows[0].tank_id) };
}

async function insertPhRun(c: Client, probe: { id: number; tankId: number }, effectiveAt: number, slopePct: number, offsetMv: number) {
  const rs = await c.execute({
    sql: `INSERT INTO calibration_runs (probe_id, tank_id, source, status, started_at, completed_at, effective_at, slope_pct, offset_mv)
          VALUES (?, ?, 'manual', 'accepted', ?, ?, ?, ?, ?) RETURNING id`,
    args: [probe.id, probe.tankId, effectiveAt, effectiveAt, effectiveAt, slopePct, offsetMv],
  });
  return num(rs.rows[0].id);
}

/** The pH readings of a probe since `from`, with the tank's temperature at the same instant. */
async function phWithTemps(c: Client, probeId: number, tempProbeId: number, from: number) {
  const rs = await c.execute({
    sql: `SELECT r.ts, r.raw, r.value, r.quality, r.calibration_run_id AS run, t.value AS temp
            FROM readings r JOIN readings t ON t.probe_id = ? AND t.ts = r.ts
           WHERE r.probe_id = ? AND r.ts >= ? ORDER BY r.ts`,
    args: [tempProbeId, probeId, from],
  });
  return rs.rows.map((r) => ({ ts: num(r.ts), raw: num(r.raw), value: num(r.value), quality: String(r.quality), run: r.run === null ? null : num(r.run), temp: num(r.temp) }));
}

describe("recomputing readings after a calibration", () => {
  it("recomputeFrom corrects every reading from the effective time on, and rebuilds its rollups", async () => {
    const { db, client, orm } = testDb;
    const ph = await probeBySerial(client, "PH-24-0101");
    const temp = await probeBySerial(client, "TS-24-0101");
    const effectiveAt = db.seedNow - 2 * DAY + 7 * 60_000 + 30_000; // mid-minute, two days back
    const beforeRows = await phWithTemps(client, ph.id, temp.id, effectiveAt - DAY);
    const oldRun = beforeRows[0].run;
    expect(oldRun).not.toBeNull();

    const runId = await insertPhRun(client, ph, effectiveAt, 95, 12);
    const result = await recomputeFrom(orm, ph.id, effectiveAt);

    const after = await phWithTemps(client, ph.id, temp.id, effectiveAt - DAY);
    const changed = after.filter((r) => r.ts >= effectiveAt);
    expect(changed.length).toBeGreaterThan(500); // five-minute history over two days
    expect(result.updated).toBe(changed.length);
    for (const r of changed) {
      expect(r.run).toBe(runId);
      expect(r.quality).toBe("ok");
      expect(r.value).toBeCloseTo(phFromMv(r.raw, r.temp, { slopePct: 95, offsetMv: 12 }), 9);
    }
    // Readings before the effective time keep the calibration they had.
    const untouched = after.filter((r) => r.ts < effectiveAt);
    expect(untouched).toEqual(beforeRows.filter((r) => r.ts < effectiveAt));

    // Every rebuilt minute is exactly the aggregate of its raw rows.
    const mismatched = await client.execute({
      sql: `SELECT count(*) AS n FROM rollups u JOIN (
              SELECT (ts / 60000) * 60000 AS minute, min(value) AS lo, max(value) AS hi, sum(value) AS total, count(value) AS n
                FROM readings WHERE probe_id = ? AND ts >= ? GROUP BY 1) a ON a.minute = u.minute
             WHERE u.probe_id = ? AND (abs(u.min - a.lo) > 1e-9 OR abs(u.max - a.hi) > 1e-9 OR abs(u.sum - a.total) > 1e-6 OR u.count != a.n)`,
      args: [ph.id, Math.floor(effectiveAt / 60_000) * 60_000, ph.id],
    });
    expect(num(mismatched.rows[0].n)).toBe(0);
    expect(result.rollupMinutes).toBe(changed.length);
    // Every rollup sits on its minute, and every hour from the effective one on is exactly the
    // aggregate of its minutes.
    const unaligned = await client.execute({ sql: "SELECT count(*) AS n FROM rollups WHERE probe_id = ? AND minute % 60000 != 0", args: [ph.id] });
    expect(num(unaligned.rows[0].n)).toBe(0);
    const hours = await client.execute({
      sql: `SELECT count(*) AS n, sum(CASE WHEN a.n IS NULL OR abs(h.min - a.lo) > 1e-9 OR abs(h.max - a.hi) > 1e-9 OR abs(h.sum - a.total) > 1e-6 OR h.count != a.n THEN 1 ELSE 0 END) AS bad
              FROM rollups_hourly h LEFT JOIN (
              SELECT (minute / 3600000) * 3600000 AS hour, min(min) AS lo, max(max) AS hi, sum(sum) AS total, sum(count) AS n
                FROM rollups WHERE probe_id = ? GROUP BY 1) a ON a.hour = h.hour
             WHERE h.probe_id = ? AND h.hour >= ?`,
      args: [ph.id, ph.id, Math.floor(effectiveAt / 3_600_000) * 3_600_000],
    });
    expect(num(hours.rows[0].n)).toBeGreaterThan(40);
    expect(num(hours.rows[0].bad)).toBe(0);

    // Withdrawing the run puts the previous calibration back.
    await client.execute({ sql: "UPDATE calibration_runs SET status = 'rejected', effective_at = NULL WHERE id = ?", args: [runId] });
    await recomputeFrom(orm, ph.id, effectiveAt);
    const reverted = await phWithTemps(client, ph.id, temp.id, effectiveAt);
    expect(new Set(reverted.map((r) => r.run))).toEqual(new Set([oldRun]));
  }, 60_000);

  it("the live ingest applies a calibration and a hold saved mid-stream, from their effective times", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    await startIngest(db, broker.url);
    const web = await connectMqtt(broker.url, serviceLogin("web", "recompute"));
    const since = Date.now();
    const sim = startSimulator(db, broker.url, ["--rate", "5", "--duration", "10"]);
    await waitFor(() => countReadingsSince(client, since), (n) => n > 200, { message: "the stream to start" });

    // As the web does when a calibration is saved: the run, then recomputeFrom for what is
    // stored already, then the event. The ingest fixes what it writes meanwhile with the old view.
    const ph = await probeBySerial(client, "PH-24-0101");
    const effectiveAt = Date.now() - 1500; // readings from 1.5 s ago on were stored with the old run
    const runId = await insertPhRun(client, ph, effectiveAt, 96, -4);
    await recomputeFrom(testDb.orm, ph.id, effectiveAt);
    // A hold is placed from now on: readings the ingest commits before it notices become held.
    const heldTank = await probeBySerial(client, "PH-24-0105");
    const placedAt = Date.now();
    await client.execute({
      sql: "INSERT INTO holds (tank_id, reason, placed_at, planned_end_at) VALUES (?, 'Probe cleaning', ?, ?)",
      args: [heldTank.tankId, placedAt, placedAt + 30 * 60_000],
    });
    const event = (type: OrgEvent["type"], tankId: number, id: number): OrgEvent => ({ v: 1, type, orgId: 1, tankId, id, at: Date.now(), summary: type });
    await web.publishAsync(topics.event(1), JSON.stringify(event("calibration.saved", ph.tankId, runId)), { qos: 1 });
    await web.publishAsync(topics.event(1), JSON.stringify(event("hold.placed", heldTank.tankId, 1)), { qos: 1 });

    const summary = await sim.done;
    await waitFor(() => countReadingsSince(client, since), (n) => n >= summary.samples, { message: "all readings" });
    await sleep(2500); // the ingest's own recompute of what it wrote before it saw the change

    const runs = await client.execute({
      sql: "SELECT ts >= ? AS after, calibration_run_id AS run, count(*) AS n FROM readings WHERE probe_id = ? AND ts >= ? GROUP BY 1, 2",
      args: [effectiveAt, ph.id, since],
    });
    const byRun = runs.rows.map((r) => ({ after: num(r.after) === 1, run: num(r.run) }));
    expect(byRun.filter((r) => r.after).map((r) => r.run)).toEqual([runId]);
    expect(byRun.filter((r) => !r.after).map((r) => r.run)).not.toContain(runId);

    const held = await client.execute({
      sql: `SELECT r.ts >= ? AS after, r.quality AS q, count(*) AS n FROM readings r JOIN probes p ON p.id = r.probe_id
             WHERE p.tank_id = ? AND r.ts >= ? GROUP BY 1, 2`,
      args: [placedAt, heldTank.tankId, since],
    });
    const flags = held.rows.map((r) => ({ after: num(r.after) === 1, q: String(r.q) }));
    expect(flags.filter((f) => f.after).map((f) => f.q)).toEqual(["held"]);
    expect(flags.filter((f) => !f.after).map((f) => f.q)).not.toContain("held");
    await endMqtt(web);
  }, 90_000);
});
