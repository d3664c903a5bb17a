// The broker's identities against an attacker on the network: no fixed service passwords, no
// process starts without its secrets, client ids that cannot be taken over, and a wrong-password
// flood that costs the broker little and locks no real device out.
import fs from "node:fs";
import bcrypt from "bcryptjs";
import { afterEach, describe, expect, it } from "vitest";
import type { MqttClient } from "mqtt";
import { deviceClientId, SERVICE_ACCOUNTS } from "../../ingest/topics";
import type { TestDatabase } from "./helpers/database";
import { connectMqtt, endMqtt, serviceLogin } from "./helpers/mqtt";
import { spawnTsx } from "./helpers/processes";
import { startBroker, startIngest } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep } from "./helpers/wait";

const testDb = useTestDatabase({ label: "broker-security" });
const open: MqttClient[] = [];

afterEach(() => {
  for (const c of open.splice(0)) c.end(true);
});

function device(d: TestDatabase, controllerId: string) {
  const all = JSON.parse(fs.readFileSync(d.credentialsFile, "utf8")) as { controllerId: string; username: string; password: string }[];
  const c = all.find((x) => x.controllerId === controllerId)!;
  return { username: c.username, password: c.password, clientId: deviceClientId(c.controllerId, `test-${process.pid}`) };
}

async function connected(url: string, opts: Parameters<typeof connectMqtt>[1]) {
  const c = await connectMqtt(url, opts);
  open.push(c);
  return c;
}

const closes = (c: MqttClient) => new Promise<void>((resolve) => c.once("close", () => resolve()));

describe("broker identities", () => {
  it("no process starts without its secrets, and says which to set", async () => {
    const { db } = testDb;
    const cases = [
      { script: "ingest/broker-main.ts", unset: "MQTT_SIMULATOR_PASSWORD" },
      { script: "ingest/main.ts", unset: "AUTH_SECRET" },
      { script: "ingest/main.ts", unset: "MQTT_INGEST_PASSWORD" },
      { script: "scripts/simulator/main.ts", unset: "MQTT_SIMULATOR_PASSWORD" },
    ];
    const env = { DATABASE_URL: db.url, BROKER_PORT: "0", MQTT_URL: "mqtt://127.0.0.1:9" };
    const runs = cases.map(({ script, unset }) => ({ script, unset, p: spawnTsx(script, script, [], { env: { ...env, [unset]: "" } }) }));
    for (const { script, unset, p } of runs) {
      const { code } = await p.exited;
      expect(code, `${script} without ${unset}`).toBe(1);
      expect(p.output()).toMatch(new RegExp(`refusing to start:\\n${unset} is not set[\\s\\S]*npm run demo`));
    }
    const short = spawnTsx("broker", "ingest/broker-main.ts", [], { env: { DATABASE_URL: db.url, BROKER_PORT: "0", MQTT_WEB_PASSWORD: "tidewell-web" } });
    expect((await short.exited).code).toBe(1);
    expect(short.output()).toContain("MQTT_WEB_PASSWORD is shorter than 16 characters");
  }, 90_000);

  it("refuses the former fixed service passwords and accepts this installation's", async () => {
    const { db } = testDb;
    const broker = await startBroker(db);
    for (const [account, former] of [
      ["ingest", "tidewell-ingest-local"],
      ["web", "tidewell-web-local"],
      ["simulator", "tidewell-simulator-local"],
    ] as const) {
      await expect(connectMqtt(broker.url, { ...serviceLogin(account, "former"), password: former }), account).rejects.toThrow(/Bad username or password/);
      await endMqtt(await connectMqtt(broker.url, serviceLogin(account, "current")));
    }
    expect(SERVICE_ACCOUNTS.web.password()).toBe(process.env.MQTT_WEB_PASSWORD);
  }, 60_000);

  it("lets a device use only its own controller's client id, and no other farm take a live controller id", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    // A controller of another organisation registered as "ctl-north", a prefix of ctl-north-l1.
    const org = await client.execute("INSERT INTO organisations (name) VALUES ('Elsewhere') RETURNING id");
    const otherOrg = Number(org.rows[0].id);
    const secret = "another-farm-device-secret";
    await client.execute({
      sql: "INSERT INTO devices (org_id, controller_id, username, secret_hash, created_at) VALUES (?, 'ctl-north', 'ctl-north', ?, ?)",
      args: [otherOrg, await bcrypt.hash(secret, 4), Date.now()],
    });

    const victim = await connected(broker.url, { ...device(db, "ctl-north-l1"), clientId: "ctl-north-l1" });
    const victimClosed = closes(victim);
    await expect(connectMqtt(broker.url, { username: "ctl-north", password: secret, clientId: "ctl-north-l1" })).rejects.toThrow(/Identifier rejected/);
    await expect(connectMqtt(broker.url, { username: "ctl-north", password: secret, clientId: "ctl-north-l1-x" })).rejects.toThrow(/Identifier rejected/);
    await broker.process.waitForLine(/refused connection: client id must be "ctl-north" or "ctl-north:\{session\}" \(username "ctl-north", client id "ctl-north-l1"/);
    // Its own ids work; the victim was never knocked offline.
    await endMqtt(await connectMqtt(broker.url, { username: "ctl-north", password: secret, clientId: "ctl-north" }));
    await endMqtt(await connectMqtt(broker.url, { username: "ctl-north", password: secret, clientId: deviceClientId("ctl-north", "spare") }));
    expect(await Promise.race([victimClosed.then(() => "closed"), sleep(500).then(() => "connected")])).toBe("connected");
    expect(victim.connected).toBe(true);

    // A second live device may not take a controller id that is live in any organisation.
    await expect(
      client.execute({
        sql: "INSERT INTO devices (org_id, controller_id, username, secret_hash, created_at) VALUES (?, 'ctl-north-l1', 'ctl-north-l1-b', 'x', ?)",
        args: [otherOrg, Date.now()],
      }),
    ).rejects.toThrow(/UNIQUE constraint failed: devices.controller_id/);
  }, 60_000);

  it("keeps each service account to its own client ids, so none can disconnect the ingest", async () => {
    const { db } = testDb;
    const broker = await startBroker(db);
    const ingest = await startIngest(db, broker.url);
    for (const account of ["web", "simulator"] as const) {
      await expect(connectMqtt(broker.url, { ...serviceLogin(account, "x"), clientId: "tidewell-ingest" }), account).rejects.toThrow(/Identifier rejected/);
      await expect(connectMqtt(broker.url, { ...serviceLogin(account, "x"), clientId: "tidewell-ingest-2" }), account).rejects.toThrow(/Identifier rejected/);
    }
    await broker.process.waitForLine(/refused connection: client id of svc-web must be "tidewell-web" or start with "tidewell-web-"/);
    await expect(connectMqtt(broker.url, { ...serviceLogin("ingest", "x"), clientId: "tidewell-web-1" })).rejects.toThrow(/Identifier rejected/);
    await sleep(300);
    expect(ingest.output()).not.toMatch(/offline|reconnect|closed/i);
  }, 60_000);

  it("throttles a wrong-password flood per username and address, without locking out the real device", async () => {
    const { db, client } = testDb;
    const broker = await startBroker(db);
    const real = device(db, "ctl-north-l1");
    // The real device connects once (its credentials are now cached), then drops off.
    await endMqtt(await connectMqtt(broker.url, real));

    const flood = Array.from({ length: 60 }, (_, i) =>
      connectMqtt(broker.url, { username: real.username, password: `guess-${i}`, clientId: `ctl-north-l1:x${i}` }).then(
        (c) => (c.end(true), "connected"),
        (err: Error) => err.message,
      ),
    );
    const outcomes = await Promise.all(flood);
    expect(outcomes).not.toContain("connected");
    const hashed = broker.process.lines.filter((l) => l.includes("refused connection: wrong-password")).length;
    const unchecked = broker.process.lines.filter((l) => l.includes("refused connection: too many failed connects")).length;
    expect(hashed).toBeLessThanOrEqual(6);
    expect(hashed + unchecked).toBe(60);
    expect(outcomes.filter((o) => /Server unavailable/.test(o)).length).toBe(unchecked);

    // The real device, with its right secret, comes straight back during the flood's lock-out.
    const started = Date.now();
    await endMqtt(await connectMqtt(broker.url, real));
    expect(Date.now() - started).toBeLessThan(2000);
    // Another username from the same address is not yet locked (the address allows more failures).
    await endMqtt(await connectMqtt(broker.url, device(db, "ctl-north-l2")));

    // Rotating the secret drops the cached verification: the old one no longer gets in.
    await client.execute({ sql: "UPDATE devices SET secret_hash = ? WHERE username = ?", args: [await bcrypt.hash("a-new-secret-of-the-device", 4), real.username] });
    await sleep(1500); // BROKER_DEVICE_RECHECK_MS is 500 in tests
    await expect(connectMqtt(broker.url, real)).rejects.toThrow(/Bad username or password|Server unavailable/);
  }, 90_000);
});
