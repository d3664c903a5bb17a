// Crashes and restarts mid-stream, with the real processes: the ingest killed with SIGKILL and
// started again, and the broker restarted; afterwards every acknowledged sample is stored once.
import { describe, expect, it } from "vitest";
import type { Client } from "@libsql/client";
import { countReadingsSince, readIngestStats, rollupCountSince, startBroker, startIngest, startSimulator } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep, waitFor } from "./helpers/wait";

const testDb = useTestDatabase({ label: "resilience" });

/** Exactly `expected` rows since `since`, and rollups that counted each of them once. */
async function expectAllStoredOnce(c: Client, since: number, expected: number) {
  await waitFor(() => countReadingsSince(c, since), (n) => n >= expected, { timeoutMs: 45_000, message: `${expected} readings` });
  await sleep(1000);
  expect(await countReadingsSince(c, since)).toBe(expected);
  const valued = Number((await c.execute({ sql: "SELECT count(*) AS n FROM readings WHERE ts >= ? AND value IS NOT NULL", args: [since] })).rows[0].n);
  expect(await rollupCountSince(c, since)).toBe(valued);
}

describe("ingest resilience", () => {
  it("loses and duplicates nothing when the ingest is killed (SIGKILL) mid-stream and restarted", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    const ingest = await startIngest(db, broker.url);
    const since = Date.now();
    // 80 tanks at 5 Hz: 1,200 samples a second for 12 s.
    const sim = startSimulator(db, broker.url, ["--tanks", "80", "--rate", "5", "--duration", "12"]);
    await waitFor(() => countReadingsSince(client, since), (n) => n > 2000, { message: "the stream to start" });
    ingest.kill("SIGKILL");
    await ingest.exited;
    const atKill = await countReadingsSince(client, since);
    await sleep(1500); // the broker queues for the ingest's persistent session meanwhile
    await startIngest(db, broker.url);
    const summary = await sim.done;
    expect(summary).toMatchObject({ failed: 0, unacknowledged: 0 });
    expect(summary.samples).toBeGreaterThan(atKill);
    await expectAllStoredOnce(client, since, summary.samples);
    // Messages committed but not yet acknowledged at the kill came again and were ignored.
    const stats = await readIngestStats(client);
    expect(stats?.readingsTotal).toBe(summary.samples - atKill);
  }, 120_000);

  it("loses nothing when the broker restarts mid-stream", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    await startIngest(db, broker.url);
    const since = Date.now();
    const sim = startSimulator(db, broker.url, ["--tanks", "80", "--rate", "5", "--duration", "12"]);
    await waitFor(() => countReadingsSince(client, since), (n) => n > 2000, { message: "the stream to start" });
    // The simulator's clients queue QoS 1 messages while the broker is away and resend them;
    // the restarted broker has the ingest's session before it accepts any device.
    await broker.restart();
    const summary = await sim.done;
    expect(summary).toMatchObject({ failed: 0, unacknowledged: 0 });
    await expectAllStoredOnce(client, since, summary.samples);
    expect(broker.process.output()).toMatch(/listening on/);
  }, 120_000);
});
