// The live stream: calibrated readings, incidents, holds and calibrations of the user's organisation
// as server-sent events, optionally narrowed to one site (?site=) or tank (?tank=).
// Event ids are reading timestamps (ms), never decreasing; a reconnecting browser sends the last one
// (Last-Event-ID, or ?since= for a fresh EventSource) and gets the readings it missed from the database.
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { notFound } from "@/app/_server/errors";
import { ALL_ROLES, guarded } from "@/app/_server/guard";
import { liveHub, type LiveMessage } from "@/app/_server/live-hub";
import type { OrgEvent } from "@/ingest/payloads";
import { readingsSince, type StreamReading } from "./backfill";
import { streamScope, tankInScope } from "./scope";
import { sseEvent, sseRetry } from "./sse";

export const dynamic = "force-dynamic";

const HEARTBEAT_MS = 15_000;
/** Batches from different tanks reach the web slightly out of timestamp order; resume a little earlier. */
const RESUME_SLACK_MS = 10_000;
const RETRY_MS = 2_000;

const streamQuery = z.object({
  site: z.coerce.number().int().positive().optional(),
  tank: z.coerce.number().int().positive().optional(),
  since: z.coerce.number().int().nonnegative().optional(),
});

const EVENT_NAME: Record<OrgEvent["type"], string> = {
  "incident.opened": "incident",
  "incident.updated": "incident",
  "incident.resolved": "incident",
  "hold.placed": "hold",
  "hold.released": "hold",
  "calibration.saved": "calibration",
};

/**
 * A live batch encoded once for every client that streams it (a thousand open walls would
 * otherwise each map and stringify the same readings): the event id is its newest timestamp.
 */
/**
 * Every open stream's pending readings are written by one shared timer every COALESCE_MS: with a
 * thousand walls open, one write per client per interval instead of one per tank batch.
 */
const COALESCE_MS = 25;
let flushers: (() => void)[] = [];
function flushSoon(flush: () => void) {
  if (flushers.length === 0) {
    setTimeout(() => {
      const due = flushers;
      flushers = [];
      for (const f of due) f();
    }, COALESCE_MS);
  }
  flushers.push(flush);
}

function concat(chunks: Uint8Array[]): Uint8Array {
  let length = 0;
  for (const c of chunks) length += c.length;
  const out = new Uint8Array(length);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

const encoded = new WeakMap<LiveMessage, { id: number; chunk: Uint8Array } | null>();
function encodedReadings(m: Extract<LiveMessage, { kind: "readings" }>) {
  let hit = encoded.get(m);
  if (hit === undefined) {
    const readings: StreamReading[] = m.readings.map((r) => ({ probeId: r.probeId, kind: r.kind, ts: r.ts, value: r.value, quality: r.quality }));
    let id = 0;
    for (const r of readings) if (r.ts > id) id = r.ts;
    hit = readings.length ? { id, chunk: sseEvent("readings", { tankId: m.tankId, readings }, id) } : null;
    encoded.set(m, hit);
  }
  return hit;
}

function lastEventId(req: Request): number | undefined {
  const raw = req.headers.get("last-event-id");
  if (!raw || !/^\d{1,16}$/.test(raw.trim())) return undefined;
  return Number(raw.trim());
}

export const GET = guarded({ roles: ALL_ROLES, query: streamQuery }, async ({ user, query, req }) => {
  // A client that cannot read an event stream (a plain fetch, a crawler) gets an answer instead of a request that never ends.
  if (!(req.headers.get("accept") ?? "").includes("text/event-stream")) {
    return Response.json(
      { error: { code: "not_acceptable", message: "This address streams server-sent events; ask for text/event-stream." } },
      { status: 406 },
    );
  }
  const db = getDb();
  const scope = await streamScope(db, user.orgId, { site: query.site, tank: query.tank });
  if (!scope) throw notFound("That site or tank");
  const resumeFrom = lastEventId(req) ?? query.since ?? null;
  const hub = liveHub();
  let cleanup = () => {};

  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      let closed = false;
      let lastId = resumeFrom ?? 0;
      // Live messages wait here while a backfill runs, so readings reach the client in order.
      let queue: LiveMessage[] | null = [];

      const send = (chunk: Uint8Array) => {
        if (closed) return;
        try {
          controller.enqueue(chunk);
        } catch {
          cleanup();
        }
      };
      // Live readings go out together every COALESCE_MS (one write instead of one per batch).
      let pending: Uint8Array[] = [];
      const flushPending = () => {
        const chunks = pending;
        pending = [];
        if (chunks.length === 1) send(chunks[0]);
        else if (chunks.length > 1) send(concat(chunks));
      };
      const sendSoon = (chunk: Uint8Array) => {
        if (pending.length === 0) flushSoon(flushPending);
        pending.push(chunk);
      };

      const sendReadings = (tankId: number, readings: StreamReading[]) => {
        if (!readings.length) return;
        flushPending();
        lastId = Math.max(lastId, ...readings.map((r) => r.ts));
        send(sseEvent("readings", { tankId, readings }, lastId));
      };

      const deliver = (m: LiveMessage) => {
        if (m.kind === "resync") {
          void backfill(lastId - RESUME_SLACK_MS);
        } else if (m.kind === "readings") {
          if (m.orgId !== scope.orgId || !tankInScope(scope, m.tankId)) return;
          const shared = encodedReadings(m);
          // Usually the batch is newer than what this client has: every client gets the same bytes.
          if (shared && shared.id >= lastId) {
            lastId = shared.id;
            sendSoon(shared.chunk);
          } else {
            sendReadings(
              m.tankId,
              m.readings.map((r) => ({ probeId: r.probeId, kind: r.kind, ts: r.ts, value: r.value, quality: r.quality })),
            );
          }
        } else if (m.event.orgId === scope.orgId && tankInScope(scope, m.event.tankId)) {
          flushPending();
          send(sseEvent(EVENT_NAME[m.event.type], m.event));
        }
      };

      const backfill = async (since: number) => {
        queue ??= [];
        try {
          const found = await readingsSince(db, scope, since);
          for (const [tankId, readings] of found.byTank) sendReadings(tankId, readings);
          send(sseEvent("backfill", { since, rows: found.rows, truncated: found.truncated }));
        } catch (err) {
          console.error("[stream] backfill failed", err);
          send(sseEvent("backfill", { since, rows: 0, truncated: true }));
        }
        const waiting = queue ?? [];
        queue = null;
        for (const m of waiting) deliver(m);
      };

      const unlisten = hub.listen((m) => (queue ? queue.push(m) : deliver(m)));

      // The heartbeat keeps proxies from closing an idle stream and re-checks that the user may
      // still watch (a deactivated account stops receiving at the next beat).
      const heartbeat = setInterval(async () => {
        try {
          const still = await db.query.users.findFirst({ columns: { id: true }, where: and(eq(users.id, user.id), eq(users.active, true)) });
          if (!still) return cleanup();
        } catch {
          /* the database is busy; check again at the next beat */
        }
        send(sseEvent("heartbeat", { now: Date.now(), broker: hub.connected }));
      }, HEARTBEAT_MS);

      cleanup = () => {
        if (closed) return;
        closed = true;
        clearInterval(heartbeat);
        unlisten();
        req.signal.removeEventListener("abort", cleanup);
        try {
          controller.close();
        } catch {
          /* already closed by the client */
        }
      };
      req.signal.addEventListener("abort", cleanup, { once: true });

      send(sseRetry(RETRY_MS));
      send(sseEvent("ready", { now: Date.now(), broker: hub.connected, resumed: resumeFrom !== null }));
      if (resumeFrom !== null) void backfill(resumeFrom - RESUME_SLACK_MS);
      else {
        const waiting = queue;
        queue = null;
        for (const m of waiting) deliver(m);
      }
    },
    cancel() {
      cleanup();
    },
  });

  return new Response(stream, {
    headers: {
      "content-type": "text/event-stream; charset=utf-8",
      // no-transform keeps compression from buffering the stream.
      "cache-control": "no-cache, no-transform",
      connection: "keep-alive",
      "x-accel-buffering": "no",
    },
  });
});
