// The one pattern every route handler and server action follows:
// check the session, check the role, parse the input with zod, run, return a typed result.
import { z } from "zod";
import type { Role } from "@/db/schema";
import { MAX_JSON_BODY_BYTES, readBodyCapped } from "./body-limit";
import { ApiError, errorAnswer, forbidden, unauthorized, validationError, type ApiErrorBody } from "./errors";
import { currentUser, type SessionUser } from "./session";

export { ALL_ROLES, CAN_CHANGE, OWNER_ONLY } from "./roles";

type Schema = z.ZodType;
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

interface RouteSpec<P, Q, B> {
  roles: readonly Role[];
  /** Shown in the 403 message: "Your role cannot {action}." */
  action?: string;
  params?: P;
  query?: Q;
  body?: B;
  /** Cap on the JSON body (default MAX_JSON_BODY_BYTES). */
  maxBodyBytes?: number;
  /** What a state-changing request may carry (default JSON). */
  accepts?: "json" | "multipart";
  status?: number;
}

export interface RouteContext<P, Q, B> {
  user: SessionUser;
  params: Out<P>;
  query: Out<Q>;
  body: Out<B>;
  req: Request;
}

type NextContext = { params: Promise<Record<string, string | string[] | undefined>> };

export function errorResponse(err: unknown): Response {
  const { status, body } = errorAnswer(err);
  return Response.json(body, { status });
}

async function authorise(roles: readonly Role[], action?: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) throw unauthorized();
  if (!roles.includes(user.role)) throw forbidden(action);
  return user;
}

function parse<S extends Schema | undefined>(schema: S, value: unknown, where: string): Out<S> {
  if (!schema) return undefined as Out<S>;
  const result = schema.safeParse(value);
  if (!result.success) throw validationError(result.error, where);
  return result.data as Out<S>;
}

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);

const hasBody = (req: Request) => Number(req.headers.get("content-length") ?? 0) > 0 || req.headers.has("transfer-encoding");

function isJson(req: Request): boolean {
  const type = req.headers.get("content-type")?.split(";")[0].trim().toLowerCase();
  return type === "application/json";
}

/**
 * Requests that change something must come from our own pages, or from a client that sends no
 * Origin (which no browser does for these). With checkBodyType below, a form or text/plain body
 * that another site's page can make a browser send without asking is refused unread.
 */
function checkRequestOrigin(req: Request): void {
  if (!STATE_CHANGING.has(req.method)) return;
  const origin = req.headers.get("origin");
  if (origin !== null) {
    const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host") ?? new URL(req.url).host;
    let originHost: string | null = null;
    try {
      originHost = new URL(origin).host;
    } catch {
      originHost = null;
    }
    if (originHost !== host) throw new ApiError(403, "cross_origin", "This request came from another site's page; Tidewell accepts changes only from its own pages.");
  }
  if (req.headers.get("sec-fetch-site") === "cross-site") throw new ApiError(403, "cross_origin", "This request came from another site's page; Tidewell accepts changes only from its own pages.");
}

/** After the session and role checks: a state-changing body must be of the kind the route reads. */
function checkBodyType(req: Request, accepts: "json" | "multipart"): void {
  if (!STATE_CHANGING.has(req.method) || !hasBody(req)) return;
  const type = req.headers.get("content-type")?.split(";")[0].trim().toLowerCase();
  if (accepts === "multipart" ? type !== "multipart/form-data" : !isJson(req)) {
    throw new ApiError(415, "unsupported_media_type", accepts === "multipart" ? "Send the file as multipart/form-data." : "Send the request body as JSON with Content-Type: application/json.");
  }
}

async function readJson(req: Request, maxBytes = MAX_JSON_BODY_BYTES): Promise<unknown> {
  if (hasBody(req) && !isJson(req)) throw new ApiError(415, "unsupported_media_type", "Send the request body as JSON with Content-Type: application/json.");
  const text = new TextDecoder().decode(await readBodyCapped(req, maxBytes));
  if (!text) return {};
  try {
    return JSON.parse(text);
  } catch {
    throw new ApiError(400, "invalid_json", "The request body is not valid JSON.");
  }
}

/**
 * Reads and validates a JSON body inside a handler. Routes on one record use it after looking the
 * record up in the caller's organisation, so another farm's ids answer 404 whatever the body says.
 */
export async function parseBody<S extends Schema>(req: Request, schema: S, maxBytes = MAX_JSON_BODY_BYTES): Promise<z.output<S>> {
  return parse(schema, await readJson(req, maxBytes), "request body") as z.output<S>;
}

/** Wraps a route handler: session, role, zod-parsed params/query/body, JSON result. */
export function guarded<P extends Schema | undefined = undefined, Q extends Schema | undefined = undefined, B extends Schema | undefined = undefined>(
  spec: RouteSpec<P, Q, B>,
  run: (ctx: RouteContext<P, Q, B>) => Promise<unknown>,
) {
  return async (req: Request, context: NextContext): Promise<Response> => {
    try {
      checkRequestOrigin(req);
      const user = await authorise(spec.roles, spec.action);
      checkBodyType(req, spec.accepts ?? "json");
      const params = parse(spec.params, await context.params, "address") as Out<P>;
      const query = parse(spec.query, Object.fromEntries(new URL(req.url).searchParams), "query") as Out<Q>;
      const body = parse(spec.body, spec.body ? await readJson(req, spec.maxBodyBytes) : undefined, "request body") as Out<B>;
      const result = await run({ user, params, query, body, req });
      if (result instanceof Response) return result;
      return Response.json(result ?? { ok: true }, { status: spec.status ?? 200 });
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export type ActionResult<T> = { ok: true; data: T } | { ok: false; error: ApiErrorBody["error"] & { status: number } };

/** Wraps a server action with the same checks; returns a result instead of throwing. */
export function guardedAction<S extends Schema, T>(
  spec: { roles: readonly Role[]; action?: string; input: S },
  run: (input: z.output<S>, user: SessionUser) => Promise<T>,
) {
  return async (raw: z.input<S>): Promise<ActionResult<T>> => {
    try {
      const user = await authorise(spec.roles, spec.action);
      const input = parse(spec.input, raw, "form") as z.output<S>;
      return { ok: true, data: await run(input, user) };
    } catch (err) {
      if (err instanceof ApiError) return { ok: false, error: { ...err.body().error, status: err.status } };
      console.error("[action] unexpected error", err);
      return { ok: false, error: { code: "internal", message: "Something went wrong on the server; nothing was changed.", status: 500 } };
    }
  };
}

export const idParam = z.object({ id: z.coerce.number().int().positive() });
