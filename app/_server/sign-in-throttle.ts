// Credential check with a back-off on repeated failures, kept in the database so it holds
// across web instances and restarts. Failures lock the pair of source address and account, so
// a stranger guessing from elsewhere cannot keep the real user locked out. A much higher
// account-wide limit is the backstop against guesses spread over many (or forged) addresses.
import bcrypt from "bcryptjs";
import { eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInAttempts, users } from "@/db/schema";

export const FREE_ATTEMPTS = 5;
/** Failures on one account from every address together before the account itself is locked. */
export const ACCOUNT_FREE_ATTEMPTS = 100;
const BASE_LOCK_MS = 30_000;
const MAX_LOCK_MS = 15 * 60_000;
const FORGET_AFTER_MS = 30 * 60_000;

// Compared against when the e-mail is unknown, so timing does not reveal which accounts exist.
const DUMMY_HASH = "$2b$10$poMg1exuOjSwTuhgPzGyR.nYU.WjSK6kD8vqp03f5bTTsVVdmzo6C";

export type PasswordCheck =
  | { ok: true; user: typeof users.$inferSelect }
  | { ok: false; code: "wrong-credentials" | "locked" | "deactivated"; retryAfterS?: number };

/** The client's address as the web server saw it (Next sets x-forwarded-for from the socket when no proxy did). */
export function clientAddress(headers: Headers | undefined): string {
  const forwarded = headers?.get("x-forwarded-for")?.split(",")[0]?.trim();
  return forwarded || headers?.get("x-real-ip") || "unknown";
}

const pairKey = (address: string, email: string) => `${address} ${email}`;
const accountKey = (email: string) => `account ${email}`;

export async function checkPassword(email: string, password: string, address: string, now = Date.now()): Promise<PasswordCheck> {
  const db = getDb();
  const keys = [pairKey(address, email), accountKey(email)];
  const attempts = await db.select().from(signInAttempts).where(inArray(signInAttempts.key, keys));
  const lockedUntil = Math.max(0, ...attempts.map((a) => a.lockedUntil ?? 0));
  if (lockedUntil > now) return { ok: false, code: "locked", retryAfterS: Math.ceil((lockedUntil - now) / 1000) };

  const user = await db.query.users.findFirst({ where: eq(users.email, email) });
  const matches = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (user && matches) {
    if (!user.active) return { ok: false, code: "deactivated" };
    // The account-wide count stays: it is about everyone else's guesses.
    await db.delete(signInAttempts).where(eq(signInAttempts.key, keys[0]));
    return { ok: true, user };
  }
  let lockedNow = 0;
  for (const [key, free] of [
    [keys[0], FREE_ATTEMPTS],
    [keys[1], ACCOUNT_FREE_ATTEMPTS],
  ] as const) {
    const attempt = attempts.find((a) => a.key === key);
    const failures = (attempt && now - attempt.lastFailureAt < FORGET_AFTER_MS ? attempt.failures : 0) + 1;
    const until = failures >= free ? now + Math.min(MAX_LOCK_MS, BASE_LOCK_MS * 2 ** (failures - free)) : null;
    lockedNow = Math.max(lockedNow, until ?? 0);
    await db
      .insert(signInAttempts)
      .values({ key, failures, lastFailureAt: now, lockedUntil: until })
      .onConflictDoUpdate({ target: signInAttempts.key, set: { failures, lastFailureAt: now, lockedUntil: until } });
  }
  if (lockedNow) return { ok: false, code: "locked", retryAfterS: Math.ceil((lockedNow - now) / 1000) };
  return { ok: false, code: "wrong-credentials" };
}
