// Credential check with a back-off on repeated failures, kept in the database so it holds
// across web instances and restarts.
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInAttempts, users } from "@/db/schema";

export const FREE_ATTEMPTS = 5;
const BASE_LOCK_MS = 30_000;
const MAX_LOCK_MS = 15 * 60_000;
const FORGET_AFTER_MS = 30 * 60_000;

// Compared against when the e-mail is unknown, so timing does not reveal which accounts exist.
const DUMMY_HASH = "$2b$10$poMg1exuOjSwTuhgPzGyR.nYU.WjSK6kD8vqp03f5bTTsVVdmzo6C";

export type PasswordCheck =
  | { ok: true; user: typeof users.$inferSelect }
  | { ok: false; code: "wrong-credentials" | "locked" | "deactivated"; retryAfterS?: number };

export async function checkPassword(email: string, password: string, now = Date.now()): Promise<PasswordCheck> {
  const db = getDb();
  const attempt = await db.query.signInAttempts.findFirst({ where: eq(signInAttempts.key, email) });
  if (attempt?.lockedUntil && attempt.lockedUntil > now) {
    return { ok: false, code: "locked", retryAfterS: Math.ceil((attempt.lockedUntil - now) / 1000) };
  }
  const user = await db.query.users.findFirst({ where: eq(users.email, email) });
  const matches = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (user && matches) {
    if (!user.active) return { ok: false, code: "deactivated" };
    if (attempt) await db.delete(signInAttempts).where(eq(signInAttempts.key, email));
    return { ok: true, user };
  }
  const previous = attempt && now - attempt.lastFailureAt < FORGET_AFTER_MS ? attempt.failures : 0;
  const failures = previous + 1;
  const lockedUntil = failures >= FREE_ATTEMPTS ? now + Math.min(MAX_LOCK_MS, BASE_LOCK_MS * 2 ** (failures - FREE_ATTEMPTS)) : null;
  await db
    .insert(signInAttempts)
    .values({ key: email, failures, lastFailureAt: now, lockedUntil })
    .onConflictDoUpdate({ target: signInAttempts.key, set: { failures, lastFailureAt: now, lockedUntil } });
  if (lockedUntil) return { ok: false, code: "locked", retryAfterS: Math.ceil((lockedUntil - now) / 1000) };
  return { ok: false, code: "wrong-credentials" };
}
