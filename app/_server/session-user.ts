// The one check of a session against the database, shared by every way in: Next's pages, route
// handlers and server actions (session.ts, through Auth.js) and the lean live-stream handler of the
// custom server (server/stream/session-cookie.ts), which reads the same session cookie itself.
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users, type Role } from "@/db/schema";

export interface SessionUser {
  id: number;
  orgId: number;
  role: Role;
  name: string;
  email: string;
  ecUnit: (typeof users.$inferSelect)["ecUnit"];
  wallSound: boolean;
}

/** What a session carries about its user, as the session token's claims map to it. */
export interface SessionClaims {
  id: string;
  sessionVersion: number;
}

/** The session token's claims (set by Auth.js's jwt callback in auth.ts) as the session shows them. */
export function claimsFromToken(token: Record<string, unknown>): SessionClaims {
  return { id: String(token.uid), sessionVersion: typeof token.sv === "number" ? token.sv : -1 };
}

/**
 * The signed-in user as the database knows them now: a deactivated user, a changed role or a
 * sign-out elsewhere takes effect on the next request, whatever the session cookie says.
 */
export async function userForSession(claims: SessionClaims | null | undefined): Promise<SessionUser | null> {
  const id = Number(claims?.id);
  if (!claims || !Number.isInteger(id)) return null;
  const row = await getDb().query.users.findFirst({ where: and(eq(users.id, id), eq(users.active, true)) });
  // A session from before the user's last sign-out is over, even though its cookie has not expired.
  if (!row || row.sessionVersion !== claims.sessionVersion) return null;
  return { id: row.id, orgId: row.orgId, role: row.role, name: row.name, email: row.email, ecUnit: row.ecUnit, wallSound: row.wallSound };
}
