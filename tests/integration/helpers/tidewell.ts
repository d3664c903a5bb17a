// Starting Tidewell's real processes on free ports against a test database, and reading what
// they did. Used by tests/integration/ingest*.test.ts and by scripts/bench.
import fs from "node:fs";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { z } from "zod";
import { ingestStats, type IngestStats } from "../../../ingest/payloads";
import { freePort } from "./ports";
import { spawnProcess, spawnTsx, type ManagedProcess } from "./processes";
import type { TestDatabase } from "./database";

export interface RunningBroker {
  process: ManagedProcess;
  port: number;
  url: string;
  /** Stops it gracefully (SIGTERM) and starts it again on the same port. */
  restart(): Promise<void>;
  stop(): Promise<void>;
}

/** The embedded broker (ingest/broker-main.ts) on a free port, its state file in the db's dir. */
export async function startBroker(db: TestDatabase, env: Record<string, string> = {}): Promise<RunningBroker> {
  const port = await freePort();
  const fullEnv = {
    DATABASE_URL: db.url,
    BROKER_PORT: String(port),
    BROKER_STATE_FILE: path.join(db.dir, "broker-state.json"),
    BROKER_DEVICE_RECHECK_MS: "500",
    ...env,
  };
  const start = async () => {
    const p = spawnTsx("broker", "ingest/broker-main.ts", [], { env: fullEnv });
    await p.waitForLine(/\[broker\] listening on/);
    return p;
  };
  const broker: RunningBroker = {
    process: await start(),
    port,
    url: `mqtt://127.0.0.1:${port}`,
    async restart() {
      await broker.process.stop(10_000);
      broker.process = await start();
    },
    stop: () => broker.process.stop(),
  };
  return broker;
}

/** The ingest worker (ingest/main.ts), waiting until it has subscribed. */
export async function startIngest(db: TestDatabase, mqttUrl: string, env: Record<string, string> = {}): Promise<ManagedProcess> {
  const p = spawnTsx("ingest", "ingest/main.ts", [], {
    env: { DATABASE_URL: db.url, MQTT_URL: mqttUrl, INGEST_HEALTH_MS: "250", RETENTION_FIRST_RUN_MS: "600000", ...env },
  });
  await p.waitForLine(/\[ingest\] subscribed /);
  return p;
}

export const simulatorSummary = z.object({
  messages: z.number().int(),
  samples: z.number().int(),
  failed: z.number().int(),
  unacknowledged: z.number().int(),
});
export type SimulatorSummary = z.infer<typeof simulatorSummary>;

export interface RunningSimulator {
  process: ManagedProcess;
  /** The summary line it prints at the end of --duration. */
  done: Promise<SimulatorSummary>;
}

/** scripts/simulator/main.ts with the test database's credentials; pass --duration for `done`. */
export function startSimulator(db: TestDatabase, mqttUrl: string, args: string[], env: Record<string, string> = {}): RunningSimulator {
  const p = spawnTsx("simulator", "scripts/simulator/main.ts", ["--credentials", db.credentialsFile, ...args], {
    env: { DATABASE_URL: db.url, MQTT_URL: mqttUrl, ...env },
  });
  const done = p
    .waitForLine(/^simulator done (\{.*\})$/, 600_000)
    .then((m) => simulatorSummary.parse(JSON.parse(m[1])));
  return { process: p, done };
}

/** Debian's mosquitto on a free port with a generated config (anonymous, no persistence). */
export async function startMosquitto(dir: string): Promise<{ process: ManagedProcess; url: string; port: number }> {
  const port = await freePort();
  const conf = path.join(dir, "mosquitto.conf");
  fs.writeFileSync(
    conf,
    [
      `listener ${port} 127.0.0.1`,
      "allow_anonymous true",
      "persistence false",
      // The ingest acknowledges after commit, so it needs more than the default 20 in flight,
      // and its persistent session must be able to queue a burst while it restarts.
      "max_inflight_messages 0",
      "max_queued_messages 100000",
      "log_dest stderr", // stdout is block-buffered when piped
      "",
    ].join("\n"),
  );
  const binary = ["/usr/sbin/mosquitto", "/usr/bin/mosquitto"].find((b) => fs.existsSync(b)) ?? "mosquitto";
  const p = spawnProcess("mosquitto", binary, ["-c", conf]);
  await p.waitForLine(/mosquitto version .* running|Opening ipv4 listen socket/);
  return { process: p, url: `mqtt://127.0.0.1:${port}`, port };
}

export function mosquittoAvailable(): boolean {
  return ["/usr/sbin/mosquitto", "/usr/bin/mosquitto"].some((b) => fs.existsSync(b));
}

/** A client on the test database for assertions (close it after use); waits for locks like the app does. */
export function openDb(db: TestDatabase): Client {
  return createClient({ url: db.url, timeout: 10_000 });
}

export async function countReadingsSince(client: Client, ts: number): Promise<number> {
  const rs = await client.execute({ sql: "SELECT count(*) AS n FROM readings WHERE ts >= ?", args: [ts] });
  return Number(rs.rows[0].n);
}

/**
 * Sum of rollup counts for minutes from ts's minute on (equals the valued rows if none
 * double-counted). Throws when the hourly rollups from ts's hour on disagree with the minutes.
 */
export async function rollupCountSince(client: Client, ts: number): Promise<number> {
  const hour = Math.floor(ts / 3_600_000) * 3_600_000;
  const both = await client.execute({
    sql: "SELECT (SELECT coalesce(sum(count), 0) FROM rollups WHERE minute >= ?) AS minutes, (SELECT coalesce(sum(count), 0) FROM rollups_hourly WHERE hour >= ?) AS hours",
    args: [hour, hour],
  });
  if (Number(both.rows[0].minutes) !== Number(both.rows[0].hours)) {
    throw new Error(`hourly rollups count ${both.rows[0].hours} readings from ${new Date(hour).toISOString()} on, minute rollups ${both.rows[0].minutes}`);
  }
  const rs = await client.execute({ sql: "SELECT coalesce(sum(count), 0) AS n FROM rollups WHERE minute >= ?", args: [Math.floor(ts / 60_000) * 60_000] });
  return Number(rs.rows[0].n);
}

export async function readIngestStats(client: Client, name = "ingest"): Promise<IngestStats | null> {
  const rs = await client.execute({ sql: "SELECT stats FROM worker_status WHERE name = ?", args: [name] });
  if (rs.rows.length === 0) return null;
  return ingestStats.parse(JSON.parse(String(rs.rows[0].stats)));
}
