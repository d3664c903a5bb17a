// Bench section "ingest": sustained readings/s from publish (through the embedded broker) to
// committed rows, against the SQLite ceiling of the same rows, and the ingest's memory.
import fs from "node:fs";
import os from "node:os";
import { createSeededDatabase } from "../../tests/integration/helpers/database";
import { openDb, readIngestStats, startBroker, startIngest, startMosquitto } from "../../tests/integration/helpers/tidewell";
import { stopAll } from "../../tests/integration/helpers/processes";
import { sleep } from "../../tests/integration/helpers/wait";
import { measureInsertCeiling } from "./ceiling";
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
    ingest_rss_mb: "MB",
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

      // Warm up, then measure committed rows over the window from the worker's own counters.
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
      await publisher.stop();
      await stopAll();
      if (!first || !last) throw new Error("the ingest wrote no health snapshot");
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
      const ceiling = measureInsertCeiling(db.file, probeIds, Math.max(100_000, Math.round(ingestRate * 5)));
      yield { metric: "sqlite_insert_ceiling_per_s", value: Math.round(ceiling), unit: "rows/s" };
      yield { metric: "ingest_vs_ceiling_ratio", value: Math.round((ingestRate / ceiling) * 1000) / 1000, unit: "ratio" };
      yield { metric: "ingest_rss_mb", value: rss, unit: "MB" };
    } finally {
      await stopAll();
      client.close();
      db.remove();
    }
  },
};
