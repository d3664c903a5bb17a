// Two ingest workers as one MQTT 5 shared subscription on Debian's mosquitto, both committing to
// the same database: one is killed (SIGKILL) mid-stream and started again under its own name
// (its persistent session kept its unacknowledged and queued share); every sample sent is stored
// once, both workers took part, and the elected alert runner raised the faulted tank's incident once.
import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { freePort } from "./helpers/ports";
import type { ManagedProcess } from "./helpers/processes";
import { countReadingsSince, mosquittoAvailable, readIngestStats, rollupCountSince, startIngest, startMosquitto, startSimulator } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep, waitFor } from "./helpers/wait";

const testDb = useTestDatabase({ label: "shared" });

const num = (v: unknown) => Number(v);

describe("several ingest workers on one shared subscription", () => {
  it.skipIf(!mosquittoAvailable())("lose, duplicate and double-alert nothing when one is killed mid-stream", async () => {
    const { db, client: c } = testDb;
    const mosquitto = await startMosquitto(db.dir);

    // One tank's solution temperature goes out of band; quick rules make it fire within seconds.
    const [first] = JSON.parse(fs.readFileSync(db.credentialsFile, "utf8")) as { controllerId: string; tankId: number }[];
    const org = num((await c.execute({ sql: "SELECT s.org_id FROM tanks t JOIN sites s ON s.id = t.site_id WHERE t.id = ?", args: [first.tankId] })).rows[0].org_id);
    await c.execute({ sql: "UPDATE tanks SET temp_min = 16, temp_max = 24 WHERE id = ?", args: [first.tankId] });
    await c.execute({
      sql: "INSERT INTO alert_rules (org_id, tank_id, cause, enabled, settings) VALUES (?, ?, 'out-of-band', 1, ?)",
      args: [org, first.tankId, JSON.stringify({ fireDelayMs: 2000, clearDelayMs: 2000 })],
    });

    const smtpNowhere = `smtp://127.0.0.1:${await freePort()}`; // mail fails and is logged; incidents are what count
    const worker = (name: string) =>
      startIngest(db, mosquitto.url, {
        INGEST_SHARED_GROUP: "tidewell-ingest",
        INGEST_WORKER_NAME: name,
        ALERTS_TICK_MS: "1000",
        ALERTS_LEASE_MS: "3000",
        SMTP_URL: smtpNowhere,
      });
    const workers: Record<string, ManagedProcess> = { a: await worker("a"), b: await worker("b") };

    const since = Date.now();
    const sim = startSimulator(db, mosquitto.url, ["--rate", "20", "--duration", "14", "--fault", `${first.controllerId}:out-of-band:temp`]);
    await waitFor(() => countReadingsSince(c, since), (n) => n > 1500, { message: "the stream to start" });
    const leaseHolder = async () => String((await c.execute("SELECT holder FROM leases WHERE name = 'alerts' AND expires_at > unixepoch('subsec') * 1000")).rows[0]?.holder ?? "");
    await waitFor(leaseHolder, (h) => h !== "", { message: "a worker to take the alert lease" });

    // Kill the worker that runs the alerts; the other takes the lease once it expires.
    const leader = (await leaseHolder()).split(":")[0];
    const survivor = leader === "a" ? "b" : "a";
    workers[leader].kill("SIGKILL");
    await workers[leader].exited;
    await waitFor(leaseHolder, (h) => h.startsWith(`${survivor}:`), { timeoutMs: 15_000, message: `worker ${survivor} to take over the alert lease` });
    await sleep(1000); // meanwhile the broker queues the killed worker's share in its session
    workers[leader] = await worker(leader);
    // Its session outlived it: the broker kept its unacknowledged and queued share for it.
    await workers[leader].waitForLine(/session present: yes/);

    const summary = await sim.done;
    expect(summary).toMatchObject({ failed: 0, unacknowledged: 0 });
    await waitFor(() => countReadingsSince(c, since), (n) => n >= summary.samples, { timeoutMs: 45_000, message: `${summary.samples} readings` });
    await sleep(1500);
    expect(await countReadingsSince(c, since)).toBe(summary.samples);
    const valued = num((await c.execute({ sql: "SELECT count(*) AS n FROM readings WHERE ts >= ? AND value IS NOT NULL", args: [since] })).rows[0].n);
    expect(await rollupCountSince(c, since)).toBe(valued);

    // Both workers committed a share.
    for (const name of ["a", "b"]) expect((await readIngestStats(c, name))?.readingsTotal ?? 0).toBeGreaterThan(0);

    // The faulted tank's incident was opened exactly once, across the takeover.
    await waitFor(
      async () => num((await c.execute({ sql: "SELECT count(*) AS n FROM incidents WHERE tank_id = ? AND cause = 'out-of-band'", args: [first.tankId] })).rows[0].n),
      (n) => n > 0,
      { message: "the out-of-band incident" },
    );
    await sleep(2000);
    const incidents = await c.execute({ sql: "SELECT id FROM incidents WHERE tank_id = ? AND cause = 'out-of-band'", args: [first.tankId] });
    expect(incidents.rows).toHaveLength(1);
    const opened = await c.execute({ sql: "SELECT count(*) AS n FROM incident_events WHERE incident_id = ? AND kind = 'opened'", args: [num(incidents.rows[0].id)] });
    expect(num(opened.rows[0].n)).toBe(1);
  }, 150_000);
});
