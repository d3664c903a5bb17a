// npm run ingest: the ingest worker. Applies migrations, subscribes to every controller's raw
// topic as svc-ingest with a persistent session, corrects and stores the samples in batches,
// acknowledges them after commit, streams the new readings, and reports its health each second.
import { applyMigrations } from "../db/migrate";
import { databaseUrl, getClient, getDb } from "../db/client";
import { controllerOfRawTopic, ingestClientId, mqttUrl, SERVICE_ACCOUNTS, topics } from "./topics";
import { orgEvent } from "./payloads";
import { createHooks, type IngestHooks } from "./hooks";
import { errorText, logger } from "./log";
import { openReadingWriter } from "./worker/batch-writer";
import { CalibrationBook } from "./worker/calibrations";
import { ingestConfig } from "./worker/config";
import { IngestMetrics } from "./worker/health";
import { HoldBook } from "./worker/holds";
import { openIngestSession } from "./worker/mqtt-session";
import { Pipeline } from "./worker/pipeline";
import { Refresher } from "./worker/refresher";
import { Refusals } from "./worker/refusals";
import { Registry } from "./worker/registry";
import { deleteExpiredReadings } from "./worker/retention";
import { TankTemperatures } from "./worker/temperatures";
import { exitUnlessSecretsSet } from "./secrets";

// AUTH_SECRET signs the acknowledge links in alert mail.
exitUnlessSecretsSet("ingest", ["AUTH_SECRET", "MQTT_INGEST_PASSWORD"]);

const log = logger("ingest");
const config = ingestConfig();

await applyMigrations();
const db = getClient();
const registry = await Registry.open(db);
const calibrations = await CalibrationBook.open(db);
const holds = await HoldBook.open(db);
const temperatures = new TankTemperatures();
await temperatures.load(db);
const writer = openReadingWriter({ url: databaseUrl(), synchronous: config.synchronous, deadLettersPerReason: config.deadLettersPerReason });
const refusals = new Refusals();
const metrics = new IngestMetrics();
log.info(`database ${databaseUrl()}: ${registry.snap.probesById.size} probes, ${registry.snap.tanks.size} tanks`);

let session: ReturnType<typeof openIngestSession> | null = null;
// Plug-ins (the alert engine) see every committed batch; see ingest/hooks.ts.
let hooks: IngestHooks | null = null;
const pipeline = new Pipeline({
  registry,
  calibrations,
  holds,
  temperatures,
  refusals,
  writer,
  metrics,
  publish: (topic, payload) => session?.publish(topic, payload),
  ackAll: (acks) => session?.ackAll(acks),
  onCommitted: (readings) => hooks?.onReadingsCommitted(readings),
  log,
  flushMs: config.flushMs,
  batchRows: config.batchRows,
  maxPendingRows: config.maxPendingRows,
  retentionDays: config.retentionDays,
});
const refresher = new Refresher({ db: getDb(), registry, calibrations, holds, pipeline, log });

// One of several workers: a shared subscription, a session of its own, an elected alert runner.
const shared = config.sharedGroup;
const clientId = shared ? (process.env.MQTT_INGEST_CLIENT_ID ?? `tidewell-ingest-${config.workerName}`) : ingestClientId();
if (shared) log.info(`worker ${config.workerName} of shared group ${shared} (client id ${clientId})`);

session = openIngestSession({
  url: mqttUrl(),
  clientId,
  username: SERVICE_ACCOUNTS.ingest.username,
  password: SERVICE_ACCOUNTS.ingest.password(),
  rawFilter: shared ? topics.sharedRaw(shared) : topics.rawWildcard,
  mqtt5SessionExpirySeconds: shared ? config.sessionExpirySeconds : undefined,
  isRawTopic: (topic) => controllerOfRawTopic(topic) !== null,
  otherFilters: [topics.eventWildcard],
  onRaw: (topic, payload, ack) => pipeline.accept(topic, payload, ack),
  onOther: (topic, payload) => {
    // Calibrations and holds changed: refresh now rather than at the next poll.
    let event: unknown;
    try {
      event = JSON.parse(payload.toString("utf8"));
    } catch {
      return;
    }
    const parsed = orgEvent.safeParse(event);
    if (parsed.success && ["calibration.saved", "hold.placed", "hold.released"].includes(parsed.data.type)) void refresher.refresh();
  },
  log,
});
hooks = createHooks({
  db: getDb(),
  publish: (topic, payload, opts) => session!.client.publishAsync(topic, payload, opts),
  electedAs: shared ? `${config.workerName}:${process.pid}:${Date.now().toString(36)}` : undefined,
});
refresher.start(config.refreshMs);

const healthTimer = setInterval(() => {
  const now = Date.now();
  const stats = metrics.snapshot(now, {
    mqttConnected: session?.client.connected ?? false,
    queueDepth: pipeline.queueDepth,
    refusals: refusals.nonZero(),
    refusalsTotal: refusals.total,
  });
  writer.writeStatus(config.workerName, now, JSON.stringify(stats)).catch((err: unknown) => log.warn(`health snapshot not written: ${errorText(err)}`));
}, config.healthMs);

const runRetention = async () => {
  const started = Date.now();
  try {
    const deleted = await deleteExpiredReadings(db, config.retentionDays);
    metrics.retention = { lastRunAt: started, deleted: metrics.retention.deleted + deleted };
    if (deleted) log.info(`retention: deleted ${deleted} readings older than ${config.retentionDays} days in ${Date.now() - started} ms`);
  } catch (err) {
    log.error("retention failed", err);
  }
};
let retentionTimer: NodeJS.Timeout | null = setTimeout(function again() {
  void runRetention().finally(() => (retentionTimer = setTimeout(again, config.retentionIntervalMs)));
}, config.retentionFirstRunMs);

let stopping = false;
for (const signal of ["SIGTERM", "SIGINT"] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    log.info(`${signal}: committing what is pending, then stopping`);
    clearInterval(healthTimer);
    if (retentionTimer) clearTimeout(retentionTimer);
    refresher.stop();
    // In a shared group a stopping worker first leaves it, so the others take its share at once,
    // then commits and acknowledges what it holds, and ends its session (nothing is queued for it).
    // The hooks stop after that last commit: its readings still go through the alert rules (and
    // a stopped alert thread is not started again for them).
    (shared ? session!.unsubscribeRaw().catch((err: unknown) => log.warn(`could not leave the shared group: ${errorText(err)}`)) : Promise.resolve())
      .then(() => pipeline.flush())
      .then(() => hooks?.stop?.())
      .then(() => session?.close(shared !== null))
      .then(() => {
        writer.close();
        log.info("stopped");
        process.exit(0);
      })
      .catch((err: unknown) => {
        log.error("shutdown failed", err);
        process.exit(1);
      });
  });
}
