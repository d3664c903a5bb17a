// Users of an organisation: list, invite, change role, deactivate and restore. At least one active
// owner who can sign in always remains, so the farm is never locked out of its own settings.
import { and, asc, count, eq, isNotNull, ne } from "drizzle-orm";
import type { z } from "zod";
import type { Db } from "../client";
import { users } from "../schema";
import { conflict, notFound } from "../../app/_server/errors";
import type { inviteUserSchema, updateUserSchema } from "../../lib/settings/schemas";
import { audit, changedFields, type Tx } from "./audit";
import { conflictOn } from "./settings-errors";
import { mailInvitation, mailInvitedElsewhere } from "./settings-invitations";

export interface Actor {
  id: number;
  orgId: number;
}

export type UserStatus = "invited" | "active" | "deactivated";

export async function listUsers(db: Db, orgId: number) {
  const rows = await db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active, passwordHash: users.passwordHash, createdAt: users.createdAt })
    .from(users)
    .where(eq(users.orgId, orgId))
    .orderBy(asc(users.name));
  return rows.map(({ passwordHash, ...u }) => ({ ...u, status: (!u.active ? "deactivated" : passwordHash === null ? "invited" : "active") as UserStatus }));
}
export type UserRow = Awaited<ReturnType<typeof listUsers>>[number];

type UserRecord = typeof users.$inferSelect;

/**
 * Creates the invited user (no password until they accept), or says the address belongs to
 * another organisation (`elsewhere`), which the caller must not reveal. Mailing is the caller's job.
 */
export async function createInvitedUser(db: Db, actor: Actor, input: z.output<typeof inviteUserSchema>, now = Date.now()): Promise<{ invitee: UserRecord } | { elsewhere: UserRecord }> {
  return db.transaction(async (tx) => {
    const existing = await tx.query.users.findFirst({ where: eq(users.email, input.email) });
    if (existing) {
      if (existing.orgId !== actor.orgId) return { elsewhere: existing };
      if (existing.passwordHash === null && existing.active) return { invitee: existing }; // invite again
      throw conflictOn("email", "Someone with this e-mail address already has an account.");
    }
    const [row] = await tx.insert(users).values({ orgId: actor.orgId, email: input.email, name: input.name, role: input.role, passwordHash: null }).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "user.invite", entity: "user", entityId: row.id, detail: { email: row.email, role: row.role } });
    return { invitee: row };
  });
}

/**
 * Invites someone and mails them. An address that already has an account with another
 * organisation gets the same answer as any invitation (so the inviter learns nothing about who
 * uses Tidewell elsewhere); its holder is mailed that nothing was changed.
 */
export async function inviteUser(db: Db, actor: Actor & { name: string }, input: z.output<typeof inviteUserSchema>): Promise<{ email: string; mailed: boolean }> {
  const created = await createInvitedUser(db, actor, input);
  if ("elsewhere" in created) return { email: input.email, mailed: await mailInvitedElsewhere(db, created.elsewhere, actor) };
  return { email: created.invitee.email, ...(await mailInvitation(db, created.invitee, actor.name)) };
}

export async function userOfOrg(db: Db, orgId: number, id: number) {
  const row = await db.query.users.findFirst({ where: and(eq(users.id, id), eq(users.orgId, orgId)) });
  if (!row) throw notFound("That user");
  return row;
}

export async function findInvitee(db: Db, orgId: number, id: number) {
  const row = await userOfOrg(db, orgId, id);
  if (row.passwordHash !== null) throw conflict("This user has already accepted their invitation.");
  if (!row.active) throw conflict("This user is deactivated; restore them before inviting again.");
  return row;
}

async function activeOwnersOtherThan(tx: Tx, orgId: number, userId: number) {
  const [{ n }] = await tx
    .select({ n: count() })
    .from(users)
    .where(and(eq(users.orgId, orgId), eq(users.role, "owner"), eq(users.active, true), isNotNull(users.passwordHash), ne(users.id, userId)));
  return n;
}

export async function updateUser(db: Db, actor: Actor, id: number, input: z.output<typeof updateUserSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const before = await tx.query.users.findFirst({ where: and(eq(users.id, id), eq(users.orgId, actor.orgId)) });
    if (!before) throw notFound("That user");
    const losesOwner = before.role === "owner" && before.active && ((input.role !== undefined && input.role !== "owner") || input.active === false);
    if (losesOwner && before.passwordHash !== null && (await activeOwnersOtherThan(tx, actor.orgId, id)) === 0) {
      throw conflict("At least one active owner must remain. Make someone else an owner first.");
    }
    const changed = changedFields(before, input);
    if (Object.keys(changed).length === 0) return before;
    const [after] = await tx.update(users).set(input).where(eq(users.id, id)).returning();
    const action = input.active === false ? "user.deactivate" : input.active === true && !before.active ? "user.restore" : "user.update";
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action, entity: "user", entityId: id, detail: { email: before.email, changed } });
    return after;
  });
}
