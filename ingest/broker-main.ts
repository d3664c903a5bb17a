// npm run broker: the embedded MQTT broker on 127.0.0.1:BROKER_PORT (default 1883).
// SIGTERM/SIGINT shut it down gracefully (see ingest/broker/server.ts).
import path from "node:path";
import { z } from "zod";
import { getClient } from "../db/client";
import { logger } from "./log";
import { startBroker } from "./broker/server";
import { exitUnlessSecretsSet } from "./secrets";

exitUnlessSecretsSet("broker", ["MQTT_INGEST_PASSWORD", "MQTT_WEB_PASSWORD", "MQTT_SIMULATOR_PASSWORD"]);

const env = z
  .object({
    BROKER_HOST: z.string().default("127.0.0.1"),
    BROKER_PORT: z.coerce.number().int().min(0).max(65535).default(1883),
    BROKER_STATE_FILE: z.string().default(path.join(process.cwd(), "data", "broker-state.json")),
    BROKER_DRAIN_MS: z.coerce.number().int().nonnegative().default(5000),
    BROKER_DEVICE_CACHE_MS: z.coerce.number().int().nonnegative().default(5 * 60_000),
    BROKER_DEVICE_RECHECK_MS: z.coerce.number().int().positive().default(2000),
    BROKER_MAX_DEVICE_PAYLOAD_BYTES: z.coerce.number().int().positive().default(1024 * 1024),
    BROKER_FAILED_CONNECTS_PER_ADDRESS: z.coerce.number().int().positive().default(20),
    BROKER_FAILED_CONNECTS_PER_USERNAME: z.coerce.number().int().positive().default(5),
  })
  .parse(process.env);

const log = logger("broker");
const broker = await startBroker({
  host: env.BROKER_HOST,
  port: env.BROKER_PORT,
  db: getClient(),
  log,
  stateFile: env.BROKER_STATE_FILE === "" ? null : env.BROKER_STATE_FILE,
  drainMs: env.BROKER_DRAIN_MS,
  deviceCacheTtlMs: env.BROKER_DEVICE_CACHE_MS,
  deviceRecheckMs: env.BROKER_DEVICE_RECHECK_MS,
  maxDevicePayloadBytes: env.BROKER_MAX_DEVICE_PAYLOAD_BYTES,
  failedConnectsPerAddress: env.BROKER_FAILED_CONNECTS_PER_ADDRESS,
  failedConnectsPerUsername: env.BROKER_FAILED_CONNECTS_PER_USERNAME,
});
log.info(`listening on ${env.BROKER_HOST}:${broker.port}`);

let stopping = false;
for (const signal of ["SIGTERM", "SIGINT"] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    log.info(`${signal}: shutting down`);
    broker
      .close()
      .then(() => {
        log.info("stopped");
        process.exit(0);
      })
      .catch((err: unknown) => {
        log.error("shutdown failed", err);
        process.exit(1);
      });
  });
}
