// Bench section "live": the night manager's screen under load, through the real processes
// (embedded broker, ingest, the web server of `npm start` — server/main.ts in front of Next — on
// the built app, built first when needed) on a seeded database of its own.
//   series_30d_ms             p95 of GET /api/tanks/[id]/series over 30 days of 1 Hz data of one probe, 2,000 points asked
//   series_365d_ms            the same over a year (older than 30 days: rollups only, as retention leaves it)
//   sse_clients_held          concurrent SSE clients (1,000) still receiving after being held for 60 s
//   sse_rss_growth_mb         growth of the web process's resident memory from before opening them to the end
//   sse_rss_growth_during_hold_mb  the same from when all were open and served to the end (a leak would show here)
//   sse_heap_growth_after_gc_mb  growth of the web's live heap (used after a full collection) over the same span as
//                             sse_rss_growth_mb: what the open streams keep, whenever V8 last collected
//   publish_to_stream_p95_ms  device publish → the reading arriving at one of those clients, at 1,000 readings/s, during the hold
import fs from "node:fs";
import path from "node:path";
import mqtt, { type MqttClient } from "mqtt";
import { createSeededDatabase } from "../../tests/integration/helpers/database";
import { openDb, startBroker, startIngest } from "../../tests/integration/helpers/tidewell";
import { REPO_ROOT, spawnProcess, spawnTsx, stopAll } from "../../tests/integration/helpers/processes";
import { freePort } from "../../tests/integration/helpers/ports";
import { sleep } from "../../tests/integration/helpers/wait";
import { sessionFor, type HttpSession } from "../../tests/e2e/session";
import { ensureBuild } from "./build";
import { deviceClientId, topics } from "../../ingest/topics";
import type { RawMessage } from "../../ingest/payloads";
import type { BenchSection, Metric, SectionOptions } from "./metric";

const DAY_MS = 86_400_000;

function p95(values: number[]): number {
  if (!values.length) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * 0.95))];
}

/** Resident memory of a process and its children, in MB (Linux /proc). */
function treeRssMb(rootPid: number): number {
  const children = new Map<number, number[]>();
  for (const entry of fs.readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
    } catch {
      /* gone */
    }
  }
  let kb = 0;
  const stack = [rootPid];
  while (stack.length) {
    const pid = stack.pop()!;
    try {
      const m = /VmRSS:\s+(\d+)/.exec(fs.readFileSync(`/proc/${pid}/status`, "utf8"));
      kb += m ? Number(m[1]) : 0;
    } catch {
      /* gone */
    }
    stack.push(...(children.get(pid) ?? []));
  }
  return kb / 1024;
}

const TS_FIELD = /"ts":(\d+)/g;

/** One SSE client: calls `onReadings` per readings event; tracks when it last heard anything. */
async function openStream(session: HttpSession, onReadings?: (r: { ts: number }[]) => void) {
  const abort = new AbortController();
  const res = await session.fetch("/api/stream", { headers: { accept: "text/event-stream" }, signal: abort.signal });
  if (res.status !== 200) throw new Error(`stream answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
  const state = { lastHeardAt: Date.now(), open: true, close: () => abort.abort() };
  void (async () => {
    const reader = res.body!.getReader();
    const decoder = new TextDecoder();
    let buffer = "";
    try {
      for (;;) {
        const { value, done } = await reader.read();
        if (done) break;
        state.lastHeardAt = Date.now();
        if (!onReadings) continue;
        buffer += decoder.decode(value, { stream: true });
        let cut: number;
        while ((cut = buffer.indexOf("\n\n")) !== -1) {
          const block = buffer.slice(0, cut);
          buffer = buffer.slice(cut + 2);
          if (!block.includes("event: readings")) continue;
          // Only the timestamps matter here: scanned, not parsed, so the timing client stays cheap.
          onReadings(Array.from(block.matchAll(TS_FIELD), (m) => ({ ts: Number(m[1]) })));
        }
      }
    } catch {
      /* aborted */
    }
    state.open = false;
  })();
  return state;
}

/** Publishes raw messages from the seeded controllers at a steady rate of readings per second. */
async function pacedPublisher(url: string, targets: { controllerId: string; username: string; password: string; serials: string[] }[], readingsPerS: number) {
  const clients: MqttClient[] = await Promise.all(
    targets.map(
      (t, i) =>
        new Promise<MqttClient>((resolve, reject) => {
          const c = mqtt.connect(url, { username: t.username, password: t.password, clientId: deviceClientId(t.controllerId, `bench-live-${process.pid}-${i}`), reconnectPeriod: 0 });
          c.once("connect", () => resolve(c));
          c.once("error", reject);
        }),
    ),
  );
  const perTick = 10; // ms
  const messagesPerTick = (readingsPerS / 3) * (perTick / 1000);
  let owed = 0;
  let next = 0;
  const seq = targets.map(() => 0);
  const lastTs = targets.map(() => 0);
  const timer = setInterval(() => {
    owed += messagesPerTick;
    while (owed >= 1) {
      owed -= 1;
      const i = next++ % targets.length;
      // The device's timestamp is its publish time, so arrival minus ts is the end-to-end latency.
      const ts = Math.max(Date.now(), lastTs[i] + 1);
      lastTs[i] = ts;
      const message: RawMessage = { v: 1, seq: seq[i]++, samples: targets[i].serials.map((serial, k) => ({ serial, ts, signal: k === 2 ? 20.5 : k === 1 ? 1000 + (ts % 50) : -20 + (ts % 7) })) };
      clients[i].publish(topics.raw(targets[i].controllerId), JSON.stringify(message), { qos: 1 });
    }
  }, perTick);
  return {
    stop: async () => {
      clearInterval(timer);
      await Promise.all(clients.map((c) => c.endAsync()));
    },
  };
}

/**
 * One new probe on a new tank: 30 days of 1 Hz readings with their minute and hourly rollups,
 * and before them 335 days of rollups alone (what retention leaves of older raw readings).
 */
export async function addYearOfHistory(client: ReturnType<typeof openDb>, now: number): Promise<number> {
  const site = Number((await client.execute("SELECT id FROM sites ORDER BY id LIMIT 1")).rows[0].id);
  const tank = await client.execute({
    sql: "INSERT INTO tanks (site_id, name, crop, ph_min, ph_max, ec_min_us, ec_max_us) VALUES (?, 'Bench tank', 'leafy greens', 5.5, 6.5, 800, 1200) RETURNING id",
    args: [site],
  });
  const tankId = Number(tank.rows[0].id);
  const probe = await client.execute({ sql: "INSERT INTO probes (tank_id, kind, serial, installed_at) VALUES (?, 'ph', 'BENCH-PH-1HZ', ?) RETURNING id", args: [tankId, now - 366 * DAY_MS] });
  const probeId = Number(probe.rows[0].id);
  const start = Math.floor((now - 30 * DAY_MS) / 60_000) * 60_000;
  const n = 30 * 86_400;
  await client.execute({
    sql: `WITH RECURSIVE s(i) AS (SELECT 0 UNION ALL SELECT i + 1 FROM s WHERE i < ?)
          INSERT INTO readings (probe_id, ts, raw, value, quality)
          SELECT ?, ? + i * 1000, 0, 6.0 + 0.3 * sin(i / 3600.0) + (abs(random()) % 100) / 5000.0, 'ok' FROM s`,
    args: [n - 1, probeId, start],
  });
  await client.execute({
    sql: `INSERT INTO rollups (probe_id, minute, min, max, sum, count)
          SELECT probe_id, (ts / 60000) * 60000, min(value), max(value), sum(value), count(value) FROM readings WHERE probe_id = ? GROUP BY ts / 60000`,
    args: [probeId],
  });
  const minutesBefore = 335 * 1440;
  await client.execute({
    sql: `WITH RECURSIVE s(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM s WHERE i < ?)
          INSERT INTO rollups (probe_id, minute, min, max, sum, count)
          SELECT ?, ? - i * 60000, 5.9, 6.1, 60 * 6.0, 60 FROM s`,
    args: [minutesBefore, probeId, start],
  });
  await client.execute({
    sql: `INSERT INTO rollups_hourly (probe_id, hour, min, max, sum, count)
          SELECT probe_id, (minute / 3600000) * 3600000, min(min), max(max), sum(sum), sum(count) FROM rollups WHERE probe_id = ? GROUP BY 1, 2`,
    args: [probeId],
  });
  // Millions of rows in one go leave a write-ahead log far larger than the ingest's steady
  // trickle ever does (SQLite checkpoints it every 1,000 pages); readers would pay for it.
  await client.execute("PRAGMA wal_checkpoint(TRUNCATE)");
  return tankId;
}

/**
 * p95 of GET /api/tanks/[id]/series over the last `days`, after a warm-up of 20 requests: the web
 * has just started, and after 5 the 30-day p95 of 40 swung between 36 and 93 ms in three runs.
 */
async function timeSeries(session: HttpSession, tankId: number, days: number, log: (line: string) => void): Promise<number> {
  const url = () => `/api/tanks/${tankId}/series?from=${Date.now() - days * DAY_MS}&to=${Date.now()}&points=2000`;
  for (let i = 0; i < 20; i++) await (await session.fetch(url())).arrayBuffer();
  const ms: number[] = [];
  let points = 0;
  let source = "";
  for (let i = 0; i < 40; i++) {
    const t0 = performance.now();
    const res = await session.fetch(url());
    if (res.status !== 200) throw new Error(`series answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
    const body = (await res.json()) as { source: string; series: { ph: { t: number[] } } };
    ms.push(performance.now() - t0);
    points = body.series.ph.t.length;
    source = body.source;
  }
  log(`series: ${points} points over ${days} days from ${source}`);
  return Math.round(p95(ms) * 10) / 10;
}

export async function* benchLive(opts: SectionOptions): AsyncIterable<Metric> {
  const { seconds, log, sseClients: clientCount, sseHoldSeconds } = opts;
  await ensureBuild(log);
  const db = await createSeededDatabase({ label: "bench-live" });
  const client = openDb(db);
  const streams: { close: () => void }[] = [];
  let webOutput = () => "";
  try {
    const now = Date.now();
    log("adding 30 days of 1 Hz readings and a year of rollups for one probe");
    const benchTank = await addYearOfHistory(client, now);

    const broker = await startBroker(db);
    await startIngest(db, broker.url);
    const port = await freePort();
    // TW_NODE_ARGS (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof") reaches the web process too.
    const nodeArgs = (process.env.TW_NODE_ARGS ?? "").split(" ").filter(Boolean);
    // --expose-gc with TW_BENCH_HEAP=1: on SIGUSR2 the web collects fully and prints its heap (server/main.ts).
    const web = spawnProcess("web", process.execPath, [...nodeArgs, "--expose-gc", "--import", "tsx", path.join(REPO_ROOT, "server/main.ts"), "-H", "127.0.0.1", "-p", String(port)], {
      env: { DATABASE_URL: db.url, MQTT_URL: broker.url, BROKER_PORT: String(broker.port), NEXT_TELEMETRY_DISABLED: "1", TW_BENCH_HEAP: "1" },
    });
    webOutput = () => web.output();
    await web.waitForLine(/Ready on/, 60_000);
    /** The web's heap used after a full collection, in MB. */
    const heapAfterGcMb = async () => {
      const pattern = /^heap-after-gc (\d+)$/;
      const seen = web.lines.filter((l) => pattern.test(l)).length;
      web.kill("SIGUSR2");
      const started = Date.now();
      for (;;) {
        const found = web.lines.filter((l) => pattern.test(l));
        if (found.length > seen) return Number(pattern.exec(found[found.length - 1])![1]) / 1024 / 1024;
        if (Date.now() - started > 30_000) throw new Error("the web did not report its heap after a collection");
        await sleep(50);
      }
    };
    const baseURL = `http://127.0.0.1:${port}`;
    const session = await sessionFor(baseURL, "night_manager");

    yield { metric: "series_30d_ms", value: await timeSeries(session, benchTank, 30, log), unit: "ms" };
    yield { metric: "series_365d_ms", value: await timeSeries(session, benchTank, 365, log), unit: "ms" };

    const probes = await client.execute("SELECT p.serial, t.controller_id FROM probes p JOIN tanks t ON t.id = p.tank_id WHERE t.controller_id IS NOT NULL ORDER BY p.id");
    const serials = new Map<string, string[]>();
    for (const r of probes.rows) serials.set(String(r.controller_id), [...(serials.get(String(r.controller_id)) ?? []), String(r.serial)]);
    const credentials = JSON.parse(fs.readFileSync(db.credentialsFile, "utf8")) as { controllerId: string; username: string; password: string }[];
    const targets = credentials.map((c) => ({ ...c, serials: serials.get(c.controllerId) ?? [] }));

    // Hold many clients (in a process of their own) while devices publish 1,000 readings/s;
    // one more client, here, times every reading.
    const rssBefore = treeRssMb(web.pid);
    const heapBefore = await heapAfterGcMb();
    log(`opening ${clientCount} SSE clients (web RSS ${rssBefore.toFixed(0)} MB)`);
    let measuring = false;
    const latencies: number[] = [];
    const watcher = await openStream(session, (readings) => {
      if (!measuring) return;
      const at = Date.now();
      for (const r of readings) latencies.push(at - r.ts);
    });
    streams.push(watcher);
    const heardWithinMs = Math.min(20_000, sseHoldSeconds * 500);
    const holders = spawnTsx("sse-holders", "scripts/bench/sse-holders.ts", [baseURL, String(clientCount - 1), String(heardWithinMs)], {
      env: { SSE_COOKIE: session.cookieHeader() },
    });
    await holders.waitForLine(/^open \d+$/, 120_000);
    const load = await pacedPublisher(broker.url, targets, 1000);
    await sleep(3000);
    measuring = true;
    const rssHolding = treeRssMb(web.pid); // every client open and served
    const holdStarted = Date.now();
    let rssPeak = 0;
    while (Date.now() - holdStarted < sseHoldSeconds * 1000) {
      await sleep(1000);
      rssPeak = Math.max(rssPeak, treeRssMb(web.pid));
    }
    measuring = false;
    const rssAfter = treeRssMb(web.pid);
    const heapAfter = await heapAfterGcMb(); // after the hold's figures: the collection pauses the web
    holders.kill("SIGTERM");
    const alive = Number((await holders.waitForLine(/^alive (\d+)$/, 30_000))[1]) + (watcher.open && watcher.lastHeardAt >= Date.now() - heardWithinMs ? 1 : 0);
    await load.stop();
    log(
      `held ${alive}/${clientCount} clients for ${sseHoldSeconds} s; web RSS ${rssAfter.toFixed(0)} MB (peak ${rssPeak.toFixed(0)}); ` +
        `heap after a full collection ${heapBefore.toFixed(1)} → ${heapAfter.toFixed(1)} MB; ${latencies.length} readings timed`,
    );
    void seconds; // the hold, not the per-section window, sets this section's length
    yield { metric: "sse_clients_held", value: alive, unit: "clients" };
    yield { metric: "sse_rss_growth_mb", value: Math.round((rssAfter - rssBefore) * 10) / 10, unit: "MB" };
    // Growth over the hold itself, once every client was open: what a leak would show.
    yield { metric: "sse_rss_growth_during_hold_mb", value: Math.round((rssAfter - rssHolding) * 10) / 10, unit: "MB" };
    yield { metric: "sse_heap_growth_after_gc_mb", value: Math.round((heapAfter - heapBefore) * 10) / 10, unit: "MB" };
    yield { metric: "publish_to_stream_p95_ms", value: Math.round(p95(latencies)), unit: "ms" };
  } catch (err) {
    log(`failed; the web's last output:\n${webOutput().split("\n").slice(-30).join("\n")}`);
    throw err;
  } finally {
    for (const s of streams) s.close();
    await stopAll();
    client.close();
    db.remove();
  }
}

export const liveSection: BenchSection = {
  name: "live",
  metrics: { series_30d_ms: "ms", series_365d_ms: "ms", sse_clients_held: "clients", sse_rss_growth_mb: "MB", sse_rss_growth_during_hold_mb: "MB", sse_heap_growth_after_gc_mb: "MB", publish_to_stream_p95_ms: "ms" },
  run: benchLive,
};
