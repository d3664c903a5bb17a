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
import { Outbox } from "./outbox";
import { sseEvent, sseRetry } from "./sse";

export const dynamic = "force-dynamic";

const HEARTBEAT_MS = 15_000;
/** Batches from different tanks reach the web slightly out of timestamp order; resume a little earlier. */
const RESUME_SLACK_MS = 10_000;
const RETRY_MS = 2_000;
/** Unread bytes after which a stalled client is dropped (its browser reconnects and backfills). */
const MAX_UNREAD_BYTES = 4 * 1024 * 1024;

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
 * otherwise each map and stringify the same readings). `withId` carries the batch's newest
 * timestamp as event id; `withoutId` is for a client that already has a newer one (batches of
 * different tanks arrive slightly out of order): an event without an id leaves the browser's last
 * event id where it was, so ids never decrease and no client needs bytes of its own.
 */
interface EncodedBatch {
  id: number;
  withId: Uint8Array;
  withoutId: Uint8Array;
}
const encoded = new WeakMap<LiveMessage, EncodedBatch | null>();
function encodedReadings(m: Extract<LiveMessage, { kind: "readings" }>): EncodedBatch | null {
  let hit = encoded.get(m);
  if (hit === undefined) {
    const readings: StreamReading[] = m.readings.map((r) => ({ probeId: r.probeId, kind: r.kind, ts: r.ts, value: r.value, quality: r.quality }));
    let id = 0;
    for (const r of readings) if (r.ts > id) id = r.ts;
    const data = { tankId: m.tankId, readings };
    hit = readings.length ? { id, withId: sseEvent("readings", data, id), withoutId: sseEvent("readings", data) } : null;
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
  const out = new Outbox(MAX_UNREAD_BYTES, () => cleanup());
  let closed = false;
  let lastId = resumeFrom ?? 0;
  // Live messages wait here while a backfill runs, so readings reach the client in order.
  let queue: LiveMessage[] | null = [];

  const sendReadings = (tankId: number, readings: StreamReading[]) => {
    if (!readings.length) return;
    lastId = Math.max(lastId, ...readings.map((r) => r.ts));
    out.send(sseEvent("readings", { tankId, readings }, lastId));
  };

  const deliver = (m: LiveMessage) => {
    if (m.kind === "resync") {
      void backfill(lastId - RESUME_SLACK_MS);
    } else if (m.kind === "readings") {
      if (m.orgId !== scope.orgId || !tankInScope(scope, m.tankId)) return;
      const shared = encodedReadings(m);
      if (!shared) return;
      // Every client gets the same bytes, written with the next shared tick.
      if (shared.id >= lastId) {
        lastId = shared.id;
        out.sendSoon(shared.withId);
      } else {
        out.sendSoon(shared.withoutId);
      }
    } else if (m.event.orgId === scope.orgId && tankInScope(scope, m.event.tankId)) {
      out.send(sseEvent(EVENT_NAME[m.event.type], m.event));
    }
  };

  const backfill = async (since: number) => {
    queue ??= [];
    try {
      const found = await readingsSince(db, scope, since);
      for (const [tankId, readings] of found.byTank) sendReadings(tankId, readings);
      out.send(sseEvent("backfill", { since, rows: found.rows, truncated: found.truncated }));
    } catch (err) {
      console.error("[stream] backfill failed", err);
      out.send(sseEvent("backfill", { since, rows: 0, truncated: true }));
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
    out.send(sseEvent("heartbeat", { now: Date.now(), broker: hub.connected }));
  }, HEARTBEAT_MS);

  cleanup = () => {
    if (closed) return;
    closed = true;
    clearInterval(heartbeat);
    unlisten();
    req.signal.removeEventListener("abort", cleanup);
    out.close();
  };
  req.signal.addEventListener("abort", cleanup, { once: true });

  out.send(sseRetry(RETRY_MS));
  out.send(sseEvent("ready", { now: Date.now(), broker: hub.connected, resumed: resumeFrom !== null }));
  if (resumeFrom !== null) void backfill(resumeFrom - RESUME_SLACK_MS);
  else {
    const waiting = queue;
    queue = null;
    for (const m of waiting) deliver(m);
  }

  return new Response(out.stream, {
    headers: {
      "content-type": "text/event-stream; charset=utf-8",
      // no-transform keeps compression from buffering the stream.
      "cache-control": "no-cache, no-transform",
      connection: "keep-alive",
      "x-accel-buffering": "no",
    },
  });
});
