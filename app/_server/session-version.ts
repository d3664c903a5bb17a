// Each user's session version is carried in their session cookie and compared on every request
// (app/_server/session.ts); bumping it ends every session issued before.
import { eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";

export async function endSessions(userId: number): Promise<void> {
  await getDb()
    .update(users)
    .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, userId));
}
