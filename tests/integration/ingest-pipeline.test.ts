// Simulator → broker → ingest → database, with the real processes on a database of its own:
// every sample the broker acknowledged is stored exactly once, corrected and flagged, rolled
// up and streamed; the same against Debian's mosquitto via MQTT_URL.
import { describe, expect, it } from "vitest";
import type { Client } from "@libsql/client";
import { readingBatch } from "../../ingest/payloads";
import { topics } from "../../ingest/topics";
import { connectMqtt, endMqtt, serviceLogin } from "./helpers/mqtt";
import {
  countReadingsSince,
  mosquittoAvailable,
  readIngestStats,
  rollupCountSince,
  startBroker,
  startIngest,
  startMosquitto,
  startSimulator,
} from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep, waitFor } from "./helpers/wait";

const testDb = useTestDatabase({ label: "pipeline" });

async function qualityOf(c: Client, tankName: string, kind: string, since: number): Promise<string[]> {
  const rs = await c.execute({
    sql: `SELECT DISTINCT r.quality FROM readings r JOIN probes p ON p.id = r.probe_id JOIN tanks t ON t.id = p.tank_id
           WHERE t.name LIKE ? AND p.kind = ? AND r.ts >= ?`,
    args: [`${tankName}%`, kind, since],
  });
  return rs.rows.map((r) => String(r.quality));
}

/** Waits until exactly `expected` rows since `since` are stored, then checks no more arrive. */
async function expectExactly(c: Client, since: number, expected: number) {
  await waitFor(() => countReadingsSince(c, since), (n) => n >= expected, { timeoutMs: 30_000, message: `${expected} readings` });
  await sleep(1000);
  expect(await countReadingsSince(c, since)).toBe(expected);
}

describe("ingest pipeline", () => {
  it("stores every acknowledged sample exactly once, corrected, flagged, rolled up and streamed", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    await startIngest(db, broker.url);
    const web = await connectMqtt(broker.url, serviceLogin("web", "pipeline"));
    let streamed = 0;
    web.on("message", (_t, payload) => (streamed += readingBatch.parse(JSON.parse(payload.toString())).readings.length));
    await web.subscribeAsync(topics.readingWildcard, { qos: 0 });

    const since = Date.now();
    // 16 tanks (the 8 seeded, twice) at 4 Hz for 5 s: 960 samples.
    const sim = startSimulator(db, broker.url, ["--tanks", "16", "--rate", "4", "--duration", "5"]);
    const summary = await sim.done;
    expect(summary).toMatchObject({ failed: 0, unacknowledged: 0 });
    expect(summary.samples).toBeGreaterThan(800);

    await expectExactly(client, since, summary.samples);
    const valued = Number((await client.execute({ sql: "SELECT count(*) AS n FROM readings WHERE ts >= ? AND value IS NOT NULL", args: [since] })).rows[0].n);
    expect(await rollupCountSince(client, since)).toBe(valued);

    // Flags from the seeded calibration record (DOMAIN: 30-day interval).
    expect(await qualityOf(client, "L1", "ph", since)).toEqual(["ok"]); // calibrated 4 days before
    expect(await qualityOf(client, "L3", "ph", since)).toEqual(["lapsed"]); // 41 days before
    expect(await qualityOf(client, "P1", "ph", since)).toEqual(["uncalibrated"]); // never
    expect(await qualityOf(client, "L1", "temp", since)).toEqual(["ok"]);
    // Plausible corrected values: pH near the bands, EC25 in µS/cm, solution temperature.
    const ranges = await client.execute({
      sql: "SELECT p.kind, min(r.value) AS lo, max(r.value) AS hi FROM readings r JOIN probes p ON p.id = r.probe_id WHERE r.ts >= ? GROUP BY p.kind",
      args: [since],
    });
    const range = Object.fromEntries(ranges.rows.map((r) => [String(r.kind), [Number(r.lo), Number(r.hi)]]));
    expect(range.ph[0]).toBeGreaterThan(4.5);
    expect(range.ph[1]).toBeLessThan(7.5);
    expect(range.ec[0]).toBeGreaterThan(400);
    expect(range.ec[1]).toBeLessThan(4000);
    expect(range.temp[0]).toBeGreaterThan(12);
    expect(range.temp[1]).toBeLessThan(28);

    const stats = await waitFor(() => readIngestStats(client), (s) => (s?.readingsTotal ?? 0) >= summary.samples, { message: "health snapshot" });
    expect(stats).toMatchObject({ readingsTotal: summary.samples, duplicatesTotal: 0, refusalsTotal: 0, mqttConnected: true });
    await waitFor(() => streamed, (n) => n >= summary.samples, { timeoutMs: 5000, message: "streamed readings" });
    expect(streamed).toBe(summary.samples);
    const seen = await client.execute("SELECT count(*) AS n FROM devices WHERE last_seen_at IS NOT NULL");
    expect(Number(seen.rows[0].n)).toBe(8);
    await endMqtt(web);
  }, 90_000);

  it.skipIf(!mosquittoAvailable())("does the same through Debian's mosquitto (MQTT_URL)", async () => {
    const { db, client } = testDb;
    const mosquitto = await startMosquitto(db.dir);
    await startIngest(db, mosquitto.url);
    const since = Date.now();
    const sim = startSimulator(db, mosquitto.url, ["--tanks", "16", "--rate", "4", "--duration", "5"]);
    const summary = await sim.done;
    expect(summary).toMatchObject({ failed: 0, unacknowledged: 0 });
    await expectExactly(client, since, summary.samples);
    expect(await rollupCountSince(client, since)).toBe(Number((await client.execute({ sql: "SELECT count(*) AS n FROM readings WHERE ts >= ? AND value IS NOT NULL", args: [since] })).rows[0].n));
  }, 90_000);
});
