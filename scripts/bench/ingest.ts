// Bench section "ingest": sustained readings/s from publish (through the embedded broker) to
// committed rows, against the SQLite ceiling of the same rows, and the ingest's memory.
import fs from "node:fs";
import os from "node:os";
import { createSeededDatabase } from "../../tests/integration/helpers/database";
import { openDb, readIngestStats, startBroker, startIngest, startMosquitto } from "../../tests/integration/helpers/tidewell";
import { stopAll } from "../../tests/integration/helpers/processes";
import { sleep } from "../../tests/integration/helpers/wait";
import { medianInsertCeiling } from "./ceiling";
import { cpuSeconds } from "./cpu";
import type { BenchSection, Metric } from "./metric";
import { LoadPublisher, type PublisherTarget } from "./publisher";

const credentials = (file: string) => JSON.parse(fs.readFileSync(file, "utf8")) as { controllerId: string; username: string; password: string; tankId: number }[];

export const ingestSection: BenchSection = {
  name: "ingest",
  metrics: {
    ingest_readings_per_s: "readings/s",
    broker_cpu_us_per_reading: "µs",
    ingest_cpu_us_per_reading: "µs",
    publisher_cpu_us_per_reading: "µs",
    load_average_1m: "load",
    sqlite_insert_ceiling_per_s: "rows/s",
    ingest_vs_ceiling_ratio: "ratio",
    ingest_rows_per_commit: "rows",
    sqlite_insert_ceiling_at_ingest_batch_per_s: "rows/s",
    ingest_vs_ceiling_at_ingest_batch_ratio: "ratio",
    ingest_rss_mb: "MB",
    ingest_drain_readings_per_s: "readings/s",
    drain_broker_cpu_us_per_reading: "µs",
    drain_ingest_cpu_us_per_reading: "µs",
    ingest_drain_vs_ceiling_ratio: "ratio",
  },
  async *run({ seconds, log, brokerKind }): AsyncIterable<Metric> {
    const db = await createSeededDatabase({ label: "bench" });
    const client = openDb(db);
    try {
      const probes = await client.execute("SELECT p.id, p.serial, p.kind, t.controller_id FROM probes p JOIN tanks t ON t.id = p.tank_id ORDER BY p.id");
      const serialsByController = new Map<string, string[]>();
      for (const r of probes.rows) {
        const list = serialsByController.get(String(r.controller_id)) ?? [];
        list.push(String(r.serial));
        serialsByController.set(String(r.controller_id), list);
      }
      const targets: PublisherTarget[] = credentials(db.credentialsFile).map((c) => ({ ...c, serials: serialsByController.get(c.controllerId) ?? [] }));

      // The embedded broker by default; --broker mosquitto measures the chain on Debian's Mosquitto.
      const broker = brokerKind === "mosquitto" ? await startMosquitto(db.dir) : await startBroker(db);
      const ingest = await startIngest(db, broker.url, { INGEST_HEALTH_MS: "500" });
      const pids = { broker: broker.process.pid, ingest: ingest.pid, publisher: process.pid };
      const cpu = () => Object.fromEntries(Object.entries(pids).map(([k, pid]) => [k, cpuSeconds(pid) ?? NaN]));
      log(`publishing through ${brokerKind === "mosquitto" ? "Mosquitto" : "the embedded broker"} at ${broker.url} from ${targets.length} controllers`);
      const publisher = new LoadPublisher(broker.url, targets);
      await publisher.start();

      // Warm up, then measure committed rows over the window from the worker's own counters (the
      // writer thread writes them; under a profiler its start can take seconds).
      for (const deadline = Date.now() + 30_000; !(await readIngestStats(client)); await sleep(100)) {
        if (Date.now() > deadline) throw new Error("the ingest wrote no health snapshot within 30 s");
      }
      await sleep(3000);
      const first = await readIngestStats(client);
      const cpu0 = cpu();
      const t0 = Date.now();
      let rss = 0;
      while (Date.now() - t0 < seconds * 1000) {
        await sleep(500);
        rss = Math.max(rss, (await readIngestStats(client))?.rssMb ?? 0);
      }
      const last = await readIngestStats(client);
      const cpu1 = cpu();
      const elapsed = (Date.now() - t0) / 1000;
      if (!first || !last) throw new Error("the ingest wrote no health snapshot");
      const drain = await measureDrain({ publisher, client, log, stopIngest: () => ingest.stop(), startIngest: () => startIngest(db, broker.url, { INGEST_HEALTH_MS: "100" }), brokerPid: broker.process.pid });
      await publisher.stop();
      await stopAll();
      const ingestRate = (last.readingsTotal - first.readingsTotal) / elapsed;
      const rows = last.readingsTotal - first.readingsTotal;
      log(`ingest committed ${rows} rows in ${elapsed.toFixed(1)} s`);
      // Where the time went: CPU µs per committed reading, per process.
      log(`CPU µs per reading: ${Object.keys(pids).map((k) => `${k} ${(((cpu1[k] - cpu0[k]) * 1e6) / rows).toFixed(1)}`).join(", ")} (the machine has ${os.cpus().length} cores, load ${os.loadavg()[0].toFixed(1)})`);
      yield { metric: "ingest_readings_per_s", value: Math.round(ingestRate), unit: "readings/s" };
      // CPU per reading does not depend on what else the machine runs, unlike the rate.
      for (const k of Object.keys(pids)) yield { metric: `${k}_cpu_us_per_reading`, value: Math.round(((cpu1[k] - cpu0[k]) * 1e7) / rows) / 10, unit: "µs" };
      yield { metric: "load_average_1m", value: Math.round(os.loadavg()[0] * 100) / 100, unit: "load" };

      const probeIds = probes.rows.map((r) => Number(r.id));
      const timed = medianInsertCeiling(db.file, probeIds, Math.max(100_000, Math.round(ingestRate * 5)));
      log(`SQLite ceiling: ${timed.runs.map((r) => Math.round(r)).join(", ")} rows/s; the median counts`);
      const ceiling = timed.median;
      yield { metric: "sqlite_insert_ceiling_per_s", value: Math.round(ceiling), unit: "rows/s" };
      yield { metric: "ingest_vs_ceiling_ratio", value: Math.round((ingestRate / ceiling) * 1000) / 1000, unit: "ratio" };
      // The same ceiling with the transactions as large as the ingest's own in this run.
      const rowsPerCommit = Math.round(rows / Math.max(1, last.flush.count - first.flush.count));
      const atBatch = medianInsertCeiling(db.file, probeIds, Math.max(100_000, Math.round(ingestRate * 5)), Math.max(50, Math.round(rowsPerCommit / 50) * 50), 4);
      log(`SQLite ceiling at the ingest's ${rowsPerCommit} rows per commit: ${atBatch.runs.map((r) => Math.round(r)).join(", ")} rows/s`);
      yield { metric: "ingest_rows_per_commit", value: rowsPerCommit, unit: "rows" };
      yield { metric: "sqlite_insert_ceiling_at_ingest_batch_per_s", value: Math.round(atBatch.median), unit: "rows/s" };
      yield { metric: "ingest_vs_ceiling_at_ingest_batch_ratio", value: Math.round((ingestRate / atBatch.median) * 1000) / 1000, unit: "ratio" };
      yield { metric: "ingest_rss_mb", value: rss, unit: "MB" };
      yield { metric: "ingest_drain_readings_per_s", value: Math.round(drain.rate), unit: "readings/s" };
      yield { metric: "drain_broker_cpu_us_per_reading", value: drain.brokerUs, unit: "µs" };
      yield { metric: "drain_ingest_cpu_us_per_reading", value: drain.ingestUs, unit: "µs" };
      yield { metric: "ingest_drain_vs_ceiling_ratio", value: Math.round((drain.rate / ceiling) * 1000) / 1000, unit: "ratio" };
    } finally {
      await stopAll();
      client.close();
      db.remove();
    }
  },
};

/** Messages queued per controller connection for the drain: 8 × 11,000 stays under Mosquitto's queue limit of 100,000. */
const DRAIN_MESSAGES_PER_CONNECTION = 11_000;

/**
 * The drain: broker → committed rows with nothing else on the machine. The ingest stops (it
 * commits and acknowledges what it holds), the publisher queues a backlog in the ingest's
 * persistent session and goes quiet, and a new ingest process drains it, as after a restart or
 * an outage. The rate is taken between 10 % and 90 % of the backlog, so the process's start-up
 * and the last batch do not count; CPU per reading over the same span.
 */
async function measureDrain(o: {
  publisher: LoadPublisher;
  client: ReturnType<typeof openDb>;
  log: (line: string) => void;
  stopIngest: () => Promise<void>;
  startIngest: () => Promise<unknown>;
  brokerPid: number;
}): Promise<{ rate: number; brokerUs: number; ingestUs: number }> {
  await o.publisher.pause();
  await o.stopIngest();
  const queued = await o.publisher.backlog(DRAIN_MESSAGES_PER_CONNECTION);
  o.log(`queued ${queued} readings for the stopped ingest; starting it again to drain them`);
  // Not awaited: with a resumed session the broker sends the backlog before it answers the new
  // subscription, so the ingest says "subscribed" only once it has drained most of it.
  const restartedAt = Date.now();
  const started = o.startIngest();
  started.catch(() => undefined);
  const marks: { at: number; rows: number; broker: number; ingest: number }[] = [];
  const deadline = Date.now() + 120_000;
  for (;;) {
    const stats = await readIngestStats(o.client);
    const at = performance.now();
    const fresh = stats !== null && stats.startedAt >= restartedAt;
    const rows = fresh ? stats.readingsTotal : 0;
    if (fresh) marks.push({ at, rows, broker: cpuSeconds(o.brokerPid) ?? NaN, ingest: cpuSeconds(stats.pid) ?? NaN });
    if (rows >= queued) break;
    if (Date.now() > deadline) throw new Error(`the ingest drained ${rows} of ${queued} readings in 120 s`);
    await sleep(50);
  }
  await started;
  const from = marks.find((m) => m.rows >= queued * 0.1)!;
  const to = marks.find((m) => m.rows >= queued * 0.9)!;
  const rows = to.rows - from.rows;
  if (rows <= 0) throw new Error("the ingest drained the backlog between two health snapshots; too short to time");
  const rate = rows / ((to.at - from.at) / 1000);
  const us = (a: number, b: number) => Math.round(((b - a) * 1e7) / rows) / 10;
  o.log(`drained ${queued} readings; ${rows} of them in ${((to.at - from.at) / 1000).toFixed(2)} s between 10 % and 90 %`);
  return { rate, brokerUs: us(from.broker, to.broker), ingestUs: us(from.ingest, to.ingest) };
}
