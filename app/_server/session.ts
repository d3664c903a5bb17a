import { cache } from "react";
import type { Role } from "@/db/schema";
import { auth } from "./auth";
import { userForSession, type SessionUser } from "./session-user";

export type { SessionUser };

/** The signed-in user of this request, checked against the database (session-user.ts). */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await auth();
  if (!session) return null;
  return userForSession({ id: session.user?.id, sessionVersion: session.user?.sessionVersion });
});

export const ROLE_LABEL: Record<Role, string> = { owner: "Owner", grower: "Grower", night_manager: "Night manager" };
