// Bench: alert rule evaluation in the ingest path. Committed batches of in-band readings from
// every seeded tank go through the alert runner (every seeded rule enabled: lib/alerts
// evaluation, the hold lookup and the engine state persisted per batch) on a seeded database
// of its own; the figure is readings evaluated per second of wall time.
import type { BenchSection, Metric } from "./metric";
import { createSeededDatabase } from "../../tests/integration/helpers/database";
import { PackedReadingsBuilder } from "../../ingest/packed-readings";

const BATCH_STEPS = 20; // timestamps per batch: a 1 s flush of 20 Hz per probe, roughly

export async function benchAlerts(opts: { seconds?: number } = {}): Promise<Metric[]> {
  const seconds = opts.seconds ?? 10;
  const db = await createSeededDatabase({ label: "bench-alerts" });
  process.env.DATABASE_URL = db.url;
  const { getDb, getClient } = await import("../../db/client");
  const { createAlertRunner } = await import("../../ingest/alerts/runner");
  try {
    const rows = await getClient().execute(
      "SELECT p.id, p.kind, p.tank_id, s.org_id, t.ph_min, t.ph_max, t.ec_min_us, t.ec_max_us, t.temp_min, t.temp_max FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN sites s ON s.id = t.site_id WHERE p.status != 'retired'",
    );
    const probes = rows.rows.map((r) => {
      const kind = String(r.kind) as "ph" | "ec" | "temp";
      const [lo, hi] = kind === "ph" ? [r.ph_min, r.ph_max] : kind === "ec" ? [r.ec_min_us, r.ec_max_us] : [r.temp_min, r.temp_max];
      return { id: Number(r.id), kind, tankId: Number(r.tank_id), orgId: Number(r.org_id), mid: (Number(lo) + Number(hi)) / 2, span: Number(hi) - Number(lo) };
    });
    const runner = createAlertRunner({ db: getDb(), publish: async () => undefined, log: () => undefined });
    let ts = db.seedNow + 60_000;
    // Packed, as the ingest hands its batches to the rules.
    const batch = () => {
      const out = new PackedReadingsBuilder();
      for (let s = 0; s < BATCH_STEPS; s++, ts += 1000) {
        for (const p of probes) {
          const wobble = Math.sin(ts / 300_000 + p.id) * 0.05;
          const value = p.mid + wobble * p.span;
          out.push(p.orgId, p.tankId, p.id, p.kind, ts, p.kind === "ph" ? (7 - value) * 59 + wobble * 10 : value + wobble * 5, value, "ok", null);
        }
      }
      return out.take();
    };
    await runner.onReadings(batch()); // warm up: context, states
    let n = 0;
    const started = performance.now();
    while (performance.now() - started < seconds * 1000) {
      const b = batch();
      await runner.onReadings(b);
      n += b.length;
    }
    const elapsed = (performance.now() - started) / 1000;
    return [{ metric: "alert_eval_readings_per_s", value: Math.round(n / elapsed), unit: "readings/s" }];
  } finally {
    getClient().close();
    db.remove();
  }
}

export const alertsSection: BenchSection = {
  name: "alerts",
  metrics: { alert_eval_readings_per_s: "readings/s" },
  async *run({ seconds }) {
    yield* await benchAlerts({ seconds });
  },
};
