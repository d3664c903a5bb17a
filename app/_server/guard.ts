// The one pattern every route handler and server action follows:
// check the session, check the role, parse the input with zod, run, return a typed result.
import { z } from "zod";
import type { Role } from "@/db/schema";
import { MAX_JSON_BODY_BYTES, readBodyCapped } from "./body-limit";
import { ApiError, forbidden, unauthorized, validationError, type ApiErrorBody } from "./errors";
import { currentUser, type SessionUser } from "./session";

export const ALL_ROLES = ["owner", "grower", "night_manager"] as const satisfies readonly Role[];
export const CAN_CHANGE = ["owner", "grower"] as const satisfies readonly Role[];
export const OWNER_ONLY = ["owner"] as const satisfies readonly Role[];

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
  if (err instanceof ApiError) return Response.json(err.body(), { status: err.status });
  console.error("[api] unexpected error", err);
  const body: ApiErrorBody = { error: { code: "internal", message: "Something went wrong on the server; nothing was changed." } };
  return Response.json(body, { status: 500 });
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

async function readJson(req: Request, maxBytes = MAX_JSON_BODY_BYTES): Promise<unknown> {
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
      const user = await authorise(spec.roles, spec.action);
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
