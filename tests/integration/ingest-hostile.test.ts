// Hostile and broken input against the real broker and ingest: malformed payloads are refused,
// counted per reason and sampled in dead_letters while the worker keeps going; devices cannot
// publish or subscribe outside their own topics, unknown or revoked credentials get nowhere.
import fs from "node:fs";
import { afterEach, describe, expect, it } from "vitest";
import type { MqttClient } from "mqtt";
import { deviceClientId, topics } from "../../ingest/topics";
import type { TestDatabase } from "./helpers/database";
import { connectMqtt, endMqtt } from "./helpers/mqtt";
import { countReadingsSince, readIngestStats, startBroker, startIngest } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep, waitFor } from "./helpers/wait";

const testDb = useTestDatabase({ label: "hostile" });
const open: MqttClient[] = [];

afterEach(() => {
  for (const c of open.splice(0)) c.end(true);
});

const credentials = (d: TestDatabase) =>
  JSON.parse(fs.readFileSync(d.credentialsFile, "utf8")) as { controllerId: string; username: string; password: string }[];

function device(d: TestDatabase, controllerId: string) {
  const c = credentials(d).find((x) => x.controllerId === controllerId)!;
  return { username: c.username, password: c.password, clientId: deviceClientId(c.controllerId, `test-${process.pid}`) };
}

const DAY = 86_400_000;

/** 1,000 payloads, each refused for exactly one reason (by the ingest), with the counts expected. */
function hostilePayloads(now: number): { payloads: (string | Buffer)[]; expected: Record<string, number> } {
  const payloads: (string | Buffer)[] = [];
  const expected: Record<string, number> = {};
  const add = (reason: string, n: number, make: (i: number) => string | Buffer) => {
    for (let i = 0; i < n; i++) payloads.push(make(i));
    expected[reason] = (expected[reason] ?? 0) + n;
  };
  const sample = (serial: string, ts: number, signal: unknown = 12.5) => ({ serial, ts, signal });
  const msg = (samples: unknown[], extra: Record<string, unknown> = {}) => JSON.stringify({ v: 1, seq: 1, samples, ...extra });
  add("invalid-json", 150, (i) => msg([sample("PH-24-0101", now)]).slice(0, 10 + (i % 40))); // truncated
  add("invalid-json", 50, (i) => Buffer.from([0xff, 0xfe, 0x00, i, 0x7b])); // not UTF-8 JSON
  const wrong: unknown[] = [
    null, 42, "text", [], {}, { v: 2, seq: 1, samples: [sample("PH-24-0101", now)] },
    { v: 1, seq: "1", samples: [sample("PH-24-0101", now)] }, { v: 1, seq: -1, samples: [sample("PH-24-0101", now)] },
    { v: 1, seq: 1, samples: [] }, { v: 1, seq: 1, samples: [sample("PH-24-0101", now, "12")] },
    { v: 1, seq: 1, samples: [sample("PH-24-0101", now, 1e12)] }, { v: 1, seq: 1, samples: [sample("PH-24-0101", -5)] },
    { v: 1, seq: 1, samples: [sample("PH-24-0101", now + 0.5)] }, { v: 1, seq: 1, samples: [sample("x".repeat(65), now)] },
    { v: 1, seq: 1, samples: Array.from({ length: 501 }, (_, k) => sample("PH-24-0101", now - k)) },
    { v: 1, seq: 1, samples: [{ serial: "PH-24-0101", ts: now }] }, { __proto__: { v: 1 }, seq: 1, samples: [] },
  ];
  add("invalid-schema", 300, (i) => JSON.stringify(wrong[i % wrong.length]));
  add("oversize", 50, () => msg([sample("PH-24-0101", now)], { pad: "x".repeat(70_000) }));
  add("unknown-probe", 150, (i) => msg([sample(`NOPE-${i}`, now - i)]));
  add("probe-not-on-this-controller", 100, (i) => msg([sample("PH-24-0102", now - i)])); // tank L2's probe
  add("future-timestamp", 150, (i) => msg([sample("PH-24-0101", now + DAY + i)]));
  add("expired-timestamp", 50, (i) => msg([sample("PH-24-0101", now - 40 * DAY - i)]));
  return { payloads, expected };
}

describe("ingest against hostile input", () => {
  it("refuses and counts 1,000 malformed or hostile payloads and keeps working", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    const ingest = await startIngest(db, broker.url);
    const since = Date.now() - 60 * DAY;
    const before = await countReadingsSince(client, since);

    const dev = await connectMqtt(broker.url, device(db, "ctl-north-l1"));
    open.push(dev);
    const { payloads, expected } = hostilePayloads(Date.now());
    expect(payloads).toHaveLength(1000);
    for (const p of payloads) await dev.publishAsync(topics.raw("ctl-north-l1"), p, { qos: 1 });

    const stats = await waitFor(() => readIngestStats(client), (s) => (s?.refusalsTotal ?? 0) >= 1000, { message: "1,000 refusals" });
    expect(stats!.refusals).toEqual(expected);
    expect(stats!.refusalsTotal).toBe(1000);
    expect(stats!.messagesTotal).toBe(1000);
    expect(await countReadingsSince(client, since)).toBe(before);

    // A bounded sample per reason, the oversize one cut short.
    const letters = await client.execute("SELECT reason, count(*) AS n, max(length(sample)) AS longest FROM dead_letters GROUP BY reason");
    expect(new Set(letters.rows.map((r) => String(r.reason)))).toEqual(new Set(Object.keys(expected)));
    for (const r of letters.rows) {
      expect(Number(r.n)).toBeGreaterThanOrEqual(1);
      expect(Number(r.n)).toBeLessThanOrEqual(20);
      expect(Number(r.longest)).toBeLessThan(2200);
    }

    // Still alive and still correct.
    expect(ingest.running).toBe(true);
    const ts = Date.now();
    const good = { v: 1, seq: 2, samples: [{ serial: "TS-24-0101", ts, signal: 20.1 }, { serial: "PH-24-0101", ts, signal: 35 }, { serial: "EC-24-0101", ts, signal: 1050 }] };
    await dev.publishAsync(topics.raw("ctl-north-l1"), JSON.stringify(good), { qos: 1 });
    await waitFor(() => countReadingsSince(client, ts), (n) => n === 3, { message: "the valid message after the flood" });
    await endMqtt(dev);
  }, 90_000);

  it("refuses foreign topics, unknown credentials, reserved client ids and revoked devices", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    await startIngest(db, broker.url);
    const since = Date.now();

    // Publishing on another tank's topic: the broker drops the message and the connection.
    const intruder = await connectMqtt(broker.url, device(db, "ctl-north-l1"));
    open.push(intruder);
    const closed = new Promise<void>((resolve) => intruder.once("close", () => resolve()));
    const forged = { v: 1, seq: 1, samples: [{ serial: "PH-24-0102", ts: since, signal: 30 }] };
    intruder.publish(topics.raw("ctl-north-l2"), JSON.stringify(forged), { qos: 1 });
    await closed;
    intruder.end(true);
    await broker.process.waitForLine(/refused publish by device ctl-north-l1 .* to "tw\/v1\/dev\/ctl-north-l2\/raw"/);

    // Subscribing to another controller's commands: refused, own commands granted.
    const dev = await connectMqtt(broker.url, device(db, "ctl-north-l1"));
    open.push(dev);
    await expect(dev.subscribeAsync(topics.commandWildcard("ctl-north-l2"), { qos: 1 })).rejects.toThrow();
    const granted = await dev.subscribeAsync(topics.commandWildcard("ctl-north-l1"), { qos: 1 });
    expect(granted[0].qos).toBe(1);
    await broker.process.waitForLine(/refused subscription by device ctl-north-l1 .* to "tw\/v1\/dev\/ctl-north-l2\/cmd\/#"/);

    // Unknown credentials and a device taking the ingest's client id: refused, and no secret logged.
    await expect(connectMqtt(broker.url, { username: "ctl-nowhere", password: "guess-123", clientId: "ctl-nowhere" })).rejects.toThrow();
    await expect(connectMqtt(broker.url, { ...device(db, "ctl-north-l1"), password: "wrong-secret" })).rejects.toThrow();
    await expect(connectMqtt(broker.url, { ...device(db, "ctl-north-l1"), clientId: "tidewell-ingest" })).rejects.toThrow();
    await broker.process.waitForLine(/refused connection: unknown-username \(username "ctl-nowhere"/);
    await broker.process.waitForLine(/refused connection: wrong-password/);
    await broker.process.waitForLine(/refused connection: client id must be/);
    const log = broker.process.output();
    expect(log).not.toContain("guess-123");
    expect(log).not.toContain("wrong-secret");
    expect(log).not.toContain(device(db, "ctl-north-l1").password);

    // Revoking a connected device: disconnected within seconds, and it cannot come back.
    const dropped = new Promise<void>((resolve) => dev.once("close", () => resolve()));
    await client.execute({ sql: "UPDATE devices SET revoked_at = ? WHERE controller_id = ?", args: [Date.now(), "ctl-north-l1"] });
    const revokedAt = Date.now();
    await dropped;
    expect(Date.now() - revokedAt).toBeLessThan(5000);
    await expect(connectMqtt(broker.url, device(db, "ctl-north-l1"))).rejects.toThrow();
    await broker.process.waitForLine(/disconnecting device ctl-north-l1: device revoked/);

    await sleep(500);
    expect(await countReadingsSince(client, since)).toBe(0);
  }, 90_000);
});
