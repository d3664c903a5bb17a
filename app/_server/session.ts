import { cache } from "react";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users, type Role } from "@/db/schema";
import { auth } from "./auth";

export interface SessionUser {
  id: number;
  orgId: number;
  role: Role;
  name: string;
  email: string;
  ecUnit: (typeof users.$inferSelect)["ecUnit"];
  wallSound: boolean;
}

/**
 * The signed-in user as the database knows them now: a deactivated user, a changed role or a
 * sign-out elsewhere takes effect on the next request, whatever the session cookie says.
 */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await auth();
  const id = Number(session?.user?.id);
  if (!session || !Number.isInteger(id)) return null;
  const row = await getDb().query.users.findFirst({ where: and(eq(users.id, id), eq(users.active, true)) });
  // A session from before the user's last sign-out is over, even though its cookie has not expired.
  if (!row || row.sessionVersion !== session.user.sessionVersion) return null;
  return { id: row.id, orgId: row.orgId, role: row.role, name: row.name, email: row.email, ecUnit: row.ecUnit, wallSound: row.wallSound };
});

export const ROLE_LABEL: Record<Role, string> = { owner: "Owner", grower: "Grower", night_manager: "Night manager" };
