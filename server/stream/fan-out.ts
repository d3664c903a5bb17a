// Live streams as plain node:http responses, fanned out per scope. Streams that watch the same
// scope (the organisation, one site's tanks, one tank) form one group with one listener on the live
// hub: the group filters and encodes each broker message once, gathers what arrives within a few
// milliseconds, and writes the same Buffer to every member's socket. A member has only its response, its last event
// id and, while it backfills from the database, the messages that wait for it.
import type { ServerResponse } from "node:http";
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { liveHub, type LiveMessage } from "@/app/_server/live-hub";
import type { OrgEvent } from "@/ingest/payloads";
import { readingsSince, type StreamReading } from "./backfill";
import { tankInScope, type StreamScope } from "./scope";
import { sseEvent, sseRetry } from "./sse";

const HEARTBEAT_MS = 15_000;
/** Batches from different tanks reach the web slightly out of timestamp order; resume a little earlier. */
export const RESUME_SLACK_MS = 10_000;
const RETRY_MS = 2_000;
/** Unread bytes after which a stalled client is dropped (its browser reconnects and backfills). */
export const MAX_UNREAD_BYTES = 4 * 1024 * 1024;
/**
 * A group writes its sockets at most once per FLUSH_INTERVAL_MS, and GATHER_MS after the first
 * message that waits: one ingest commit publishes the batches of all its tanks within a few
 * milliseconds, so they go out together in one write per socket without waiting a whole interval.
 */
const GATHER_MS = 5;
const FLUSH_INTERVAL_MS = 25;

const EVENT_NAME: Record<OrgEvent["type"], string> = {
  "incident.opened": "incident",
  "incident.updated": "incident",
  "incident.resolved": "incident",
  "hold.placed": "hold",
  "hold.released": "hold",
  "calibration.saved": "calibration",
};

/**
 * A live batch encoded once for every stream that carries it. `withId` has the batch's newest
 * timestamp as event id; `withoutId` is for a stream that already carried a newer one (batches of
 * different tanks arrive slightly out of order): an event without an id leaves the browser's last
 * event id where it was, so ids never decrease.
 */
interface EncodedBatch {
  id: number;
  withId: Buffer;
  withoutId: Buffer;
}
type Pending = { kind: "readings"; batch: EncodedBatch } | { kind: "event"; bytes: Buffer };

// Groups of different scopes see the same message: encoded once for all of them.
const encodedBatches = new WeakMap<LiveMessage, EncodedBatch | null>();
function encodedReadings(m: Extract<LiveMessage, { kind: "readings" }>): EncodedBatch | null {
  let hit = encodedBatches.get(m);
  if (hit === undefined) {
    const readings: StreamReading[] = m.readings.map((r) => ({ probeId: r.probeId, kind: r.kind, ts: r.ts, value: r.value, quality: r.quality }));
    let id = 0;
    for (const r of readings) if (r.ts > id) id = r.ts;
    const data = { tankId: m.tankId, readings };
    hit = readings.length ? { id, withId: sseEvent("readings", data, id), withoutId: sseEvent("readings", data) } : null;
    encodedBatches.set(m, hit);
  }
  return hit;
}
const encodedEvents = new WeakMap<LiveMessage, Buffer>();
function encodedEvent(m: Extract<LiveMessage, { kind: "event" }>): Buffer {
  let hit = encodedEvents.get(m);
  if (!hit) encodedEvents.set(m, (hit = sseEvent(EVENT_NAME[m.event.type], m.event)));
  return hit;
}

/** The bytes of `items` for a stream whose last event id is `lastId`, and its last event id after them. */
function encodeFor(items: Pending[], lastId: number): { bytes: Buffer; lastId: number } {
  const chunks: Buffer[] = [];
  for (const item of items) {
    if (item.kind === "event") chunks.push(item.bytes);
    else if (item.batch.id >= lastId) {
      lastId = item.batch.id;
      chunks.push(item.batch.withId);
    } else chunks.push(item.batch.withoutId);
  }
  return { bytes: chunks.length === 1 ? chunks[0] : Buffer.concat(chunks), lastId };
}

class StreamClient {
  private closed = false;
  /** Live messages wait here while a backfill runs, so readings reach the client in order. */
  private waiting: Pending[] | null = null;

  constructor(
    private readonly res: ServerResponse,
    readonly userId: number,
    private readonly scope: StreamScope,
    /** The newest event id this stream carried (what the browser will send back on reconnecting). */
    public lastId: number,
  ) {}

  write(bytes: Buffer) {
    if (this.closed || this.res.writableEnded || this.res.destroyed) return;
    this.res.write(bytes);
    // A reader this far behind is dropped rather than buffered for; its browser reconnects and backfills.
    if (this.res.writableLength > MAX_UNREAD_BYTES) this.res.destroy();
  }

  /** The group's bytes of one tick, carried with event ids from `groupLastId` up to `groupNewId`. */
  take(items: Pending[], bytes: Buffer, groupLastId: number, groupNewId: number) {
    if (this.waiting) {
      this.waiting.push(...items);
    } else if (this.lastId <= groupLastId) {
      // Every id in the shared bytes is at least groupLastId, so none goes below this stream's.
      this.write(bytes);
      if (groupNewId > groupLastId) this.lastId = groupNewId;
    } else {
      // Ahead of the group (it resumed from newer readings): bytes of its own until the group catches up.
      const own = encodeFor(items, this.lastId);
      this.write(own.bytes);
      this.lastId = own.lastId;
    }
  }

  async backfill(since: number) {
    this.waiting ??= [];
    try {
      const found = await readingsSince(getDb(), this.scope, since);
      for (const [tankId, readings] of found.byTank) {
        if (!readings.length) continue;
        for (const r of readings) if (r.ts > this.lastId) this.lastId = r.ts;
        this.write(sseEvent("readings", { tankId, readings }, this.lastId));
      }
      this.write(sseEvent("backfill", { since, rows: found.rows, truncated: found.truncated }));
    } catch (err) {
      console.error("[stream] backfill failed", err);
      this.write(sseEvent("backfill", { since, rows: 0, truncated: true }));
    }
    const waiting = this.waiting ?? [];
    this.waiting = null;
    if (waiting.length) {
      const own = encodeFor(waiting, this.lastId);
      this.write(own.bytes);
      this.lastId = own.lastId;
    }
  }

  resync() {
    void this.backfill(this.lastId - RESUME_SLACK_MS);
  }

  /** Ends the stream cleanly (the user may no longer watch). */
  end() {
    if (this.closed || this.res.writableEnded) return;
    this.res.end();
  }

  markClosed() {
    this.closed = true;
    this.waiting = null;
  }
}

class ScopeGroup {
  readonly clients = new Set<StreamClient>();
  private pending: Pending[] = [];
  private timer: NodeJS.Timeout | null = null;
  private flushedAt = 0;
  /** The newest event id the group's shared bytes carried. */
  private lastId = 0;
  private readonly unlisten: () => void;

  constructor(
    readonly key: string,
    private readonly scope: StreamScope,
  ) {
    this.unlisten = liveHub().listen((m) => this.onMessage(m));
  }

  private onMessage(m: LiveMessage) {
    if (m.kind === "resync") {
      for (const c of this.clients) c.resync();
      return;
    }
    if (m.kind === "readings") {
      if (m.orgId !== this.scope.orgId || !tankInScope(this.scope, m.tankId)) return;
      const batch = encodedReadings(m);
      if (!batch) return;
      this.pending.push({ kind: "readings", batch });
    } else {
      if (m.event.orgId !== this.scope.orgId || !tankInScope(this.scope, m.event.tankId)) return;
      this.pending.push({ kind: "event", bytes: encodedEvent(m) });
    }
    this.timer ??= setTimeout(this.flush, Math.max(GATHER_MS, this.flushedAt + FLUSH_INTERVAL_MS - Date.now()));
  }

  private readonly flush = () => {
    this.timer = null;
    this.flushedAt = Date.now();
    const items = this.pending;
    this.pending = [];
    if (!items.length) return;
    const from = this.lastId;
    const shared = encodeFor(items, from);
    this.lastId = shared.lastId;
    for (const c of this.clients) c.take(items, shared.bytes, from, shared.lastId);
  };

  close() {
    if (this.timer) clearTimeout(this.timer);
    this.unlisten();
  }
}

const groups = new Map<string, ScopeGroup>();
const everyClient = new Set<StreamClient>();
let heartbeat: NodeJS.Timeout | null = null;

function scopeKey(scope: StreamScope): string {
  return `${scope.orgId}:${scope.tankIds === null ? "*" : [...scope.tankIds].sort((a, b) => a - b).join(",")}`;
}

/**
 * The heartbeat keeps proxies from closing an idle stream and re-checks that each stream's user may
 * still watch (a deactivated account stops receiving at the next beat): one query and one shared
 * encoding for every open stream.
 */
async function beat() {
  const userIds = [...new Set([...everyClient].map((c) => c.userId))];
  if (!userIds.length) return;
  let active: Set<number> | null = null;
  try {
    const rows = await getDb()
      .select({ id: users.id })
      .from(users)
      .where(and(inArray(users.id, userIds), eq(users.active, true)));
    active = new Set(rows.map((r) => r.id));
  } catch {
    /* the database is busy; check again at the next beat */
  }
  const bytes = sseEvent("heartbeat", { now: Date.now(), broker: liveHub().connected });
  for (const c of everyClient) {
    if (active && !active.has(c.userId)) c.end();
    else c.write(bytes);
  }
}

/**
 * Streams live events to `res` (headers already checked and written by the caller) until the
 * client goes away. With `resumeFrom` (Last-Event-ID or ?since=) it first sends the readings
 * stored since then, a little earlier for the slack.
 */
export function openStream(res: ServerResponse, opts: { userId: number; scope: StreamScope; resumeFrom: number | null }) {
  const hub = liveHub();
  const key = scopeKey(opts.scope);
  let group = groups.get(key);
  if (!group) groups.set(key, (group = new ScopeGroup(key, opts.scope)));
  const client = new StreamClient(res, opts.userId, opts.scope, opts.resumeFrom ?? 0);
  const joined = group;
  joined.clients.add(client);
  everyClient.add(client);
  heartbeat ??= setInterval(() => void beat(), HEARTBEAT_MS);

  res.once("close", () => {
    client.markClosed();
    joined.clients.delete(client);
    everyClient.delete(client);
    if (joined.clients.size === 0 && groups.get(key) === joined) {
      joined.close();
      groups.delete(key);
    }
    if (everyClient.size === 0 && heartbeat) {
      clearInterval(heartbeat);
      heartbeat = null;
    }
  });

  client.write(sseRetry(RETRY_MS));
  client.write(sseEvent("ready", { now: Date.now(), broker: hub.connected, resumed: opts.resumeFrom !== null }));
  if (opts.resumeFrom !== null) void client.backfill(opts.resumeFrom - RESUME_SLACK_MS);
}

/** Open streams and scope groups in this process (for tests and diagnostics). */
export function streamStats() {
  return { streams: everyClient.size, groups: groups.size, hubListeners: liveHub().listenerCount };
}
