// GET /api/stream, answered by the custom server (server/main.ts) on plain node:http, not by Next:
// calibrated readings, incidents, holds and calibrations of the user's organisation as server-sent
// events, optionally narrowed to one site (?site=) or tank (?tank=). Event ids are reading
// timestamps (ms), never decreasing; a reconnecting browser sends the last one (Last-Event-ID, or
// ?since= for a fresh EventSource) and gets the readings it missed from the database.
//
// The checks and answers are those of every route behind the guard (app/_server/guard.ts): the
// session (same cookie, same database check), the role, the zod-parsed query, errors in the one
// JSON shape. Why not a Next route handler: see README, "Speed and scale".
import type { IncomingMessage, ServerResponse } from "node:http";
import { z } from "zod";
import { getDb } from "@/db/client";
import { ApiError, errorAnswer, forbidden, notFound, unauthorized, validationError } from "@/app/_server/errors";
import { ALL_ROLES } from "@/app/_server/roles";
import { securityHeaders } from "../security-headers";
import { STREAM_PATH } from "../routes";
import { openStream } from "./fan-out";
import { sessionUserOf } from "./session-cookie";
import { streamScope } from "./scope";

const streamQuery = z.object({
  site: z.coerce.number().int().positive().optional(),
  tank: z.coerce.number().int().positive().optional(),
  since: z.coerce.number().int().nonnegative().optional(),
});

const SECURITY_HEADERS = Object.fromEntries(securityHeaders(process.env.NODE_ENV !== "production").map((h) => [h.key, h.value]));

function lastEventId(req: IncomingMessage): number | undefined {
  const raw = req.headers["last-event-id"];
  if (typeof raw !== "string" || !/^\d{1,16}$/.test(raw.trim())) return undefined;
  return Number(raw.trim());
}

function answerError(res: ServerResponse, err: unknown, extraHeaders: Record<string, string> = {}) {
  if (res.headersSent || res.destroyed) return;
  const { status, body } = errorAnswer(err);
  res.writeHead(status, { ...SECURITY_HEADERS, ...extraHeaders, "content-type": "application/json", "cache-control": "no-store" });
  res.end(JSON.stringify(body));
}

export { STREAM_PATH };

export async function handleStream(req: IncomingMessage, res: ServerResponse): Promise<void> {
  try {
    if (req.method !== "GET") {
      return answerError(res, new ApiError(405, "method_not_allowed", "This address only answers GET."), { allow: "GET" });
    }
    const user = await sessionUserOf(req);
    if (!user) throw unauthorized();
    if (!(ALL_ROLES as readonly string[]).includes(user.role)) throw forbidden("watch the live stream");
    const parsed = streamQuery.safeParse(Object.fromEntries(new URL(req.url ?? "/", "http://localhost").searchParams));
    if (!parsed.success) throw validationError(parsed.error, "query");
    const query = parsed.data;
    // A client that cannot read an event stream (a plain fetch, a crawler) gets an answer instead of a request that never ends.
    if (!(req.headers.accept ?? "").includes("text/event-stream")) {
      throw new ApiError(406, "not_acceptable", "This address streams server-sent events; ask for text/event-stream.");
    }
    const scope = await streamScope(getDb(), user.orgId, { site: query.site, tank: query.tank });
    if (!scope) throw notFound("That site or tank");
    if (res.destroyed || !res.socket || res.socket.destroyed) return; // gone while we checked
    res.writeHead(200, {
      ...SECURITY_HEADERS,
      "content-type": "text/event-stream; charset=utf-8",
      // no-transform keeps compression from buffering the stream.
      "cache-control": "no-cache, no-transform",
      connection: "keep-alive",
      "x-accel-buffering": "no",
    });
    openStream(res, { userId: user.id, scope, resumeFrom: lastEventId(req) ?? query.since ?? null });
  } catch (err) {
    answerError(res, err);
  }
}
