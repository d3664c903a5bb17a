// The signed-in user of a plain node:http request, for handlers the custom server answers without
// Next (server/stream/handler.ts). It reads the session cookie exactly as Auth.js does for
// `auth()` in app/_server/auth.ts — the same cookie name and salt, the same secret, the same token
// claims — and applies the same database check (app/_server/session-user.ts).
import type { IncomingMessage } from "node:http";
import type { TLSSocket } from "node:tls";
import { getToken } from "next-auth/jwt";
import { claimsFromToken, userForSession, type SessionUser } from "@/app/_server/session-user";
import { requireSecret } from "@/ingest/secrets";

/**
 * Auth.js names the cookie `__Secure-authjs.session-token` when the site is served over https and
 * `authjs.session-token` otherwise. It decides from AUTH_URL (or NEXTAUTH_URL) when set, else from
 * the X-Forwarded-Proto that Next sets (from the proxy's header, or from the socket), as here.
 */
function servedOverHttps(req: IncomingMessage): boolean {
  const configured = process.env.AUTH_URL ?? process.env.NEXTAUTH_URL;
  if (configured) return new URL(configured).protocol === "https:";
  const forwarded = req.headers["x-forwarded-proto"];
  const proto = (Array.isArray(forwarded) ? forwarded[0] : forwarded) ?? ((req.socket as TLSSocket).encrypted ? "https" : "http");
  return proto === "https";
}

export async function sessionUserOf(req: IncomingMessage): Promise<SessionUser | null> {
  const cookie = req.headers.cookie;
  if (!cookie) return null;
  // Only the cookie is passed on: getToken would also take a Bearer token, which auth() does not.
  const token = await getToken({ req: { headers: { cookie } }, secret: requireSecret("AUTH_SECRET"), secureCookie: servedOverHttps(req) });
  if (!token) return null;
  return userForSession(claimsFromToken(token));
}
