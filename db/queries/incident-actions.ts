// What people do to incidents: acknowledge (any role, also from a signed mail link), add notes,
// resolve by hand (grower, owner). Each in one transaction with its timeline event and audit row.
import { and, eq } from "drizzle-orm";
import type { Db } from "../client";
import { incidentEvents, incidents, usedTokens, users } from "../schema";
import { conflict, notFound, unprocessable } from "../../app/_server/errors";
import { audit, type Tx } from "./audit";

type Actor = { id: number; orgId: number };

async function incidentOfOrg(tx: Tx, orgId: number, id: number) {
  const [row] = await tx.select().from(incidents).where(and(eq(incidents.id, id), eq(incidents.orgId, orgId)));
  if (!row) throw notFound("That incident");
  return row;
}

async function acknowledgeIn(tx: Tx, user: Actor, id: number, note: string | undefined, now: number, via: string | null) {
  const row = await incidentOfOrg(tx, user.orgId, id);
  if (row.state !== "open") throw conflict(`This incident is already ${row.state}.`);
  const [updated] = await tx
    .update(incidents)
    .set({ state: "acknowledged", acknowledgedAt: now, acknowledgedBy: user.id })
    .where(and(eq(incidents.id, id), eq(incidents.state, "open")))
    .returning();
  if (!updated) throw conflict("This incident was acknowledged a moment ago.");
  await tx.insert(incidentEvents).values({ incidentId: id, at: now, kind: "acknowledged", userId: user.id, detail: via });
  if (note) await tx.insert(incidentEvents).values({ incidentId: id, at: now, kind: "note", userId: user.id, detail: note });
  await audit(tx, { orgId: user.orgId, at: now, userId: user.id, action: "incident.acknowledge", entity: "incident", entityId: id, detail: via ? { via } : null });
  return updated;
}

/** Acknowledges an open incident of the user's organisation, with an optional note. */
export async function acknowledgeIncident(db: Db, user: Actor, id: number, note?: string, now = Date.now()) {
  return db.transaction((tx) => acknowledgeIn(tx, user, id, note, now, null));
}

/** Resolves an open or acknowledged incident by hand, with an optional note. */
export async function resolveIncident(db: Db, user: Actor, id: number, note?: string, now = Date.now()) {
  return db.transaction(async (tx) => {
    const row = await incidentOfOrg(tx, user.orgId, id);
    if (row.state === "resolved") throw conflict("This incident is already resolved.");
    const [updated] = await tx
      .update(incidents)
      .set({ state: "resolved", resolvedAt: now, resolvedBy: user.id, acknowledgedAt: row.acknowledgedAt ?? now, acknowledgedBy: row.acknowledgedBy ?? user.id })
      .where(eq(incidents.id, id))
      .returning();
    await tx.insert(incidentEvents).values({ incidentId: id, at: now, kind: "resolved", userId: user.id, detail: note || null });
    await audit(tx, { orgId: user.orgId, at: now, userId: user.id, action: "incident.resolve", entity: "incident", entityId: id });
    return updated;
  });
}

export async function addIncidentNote(db: Db, user: Actor, id: number, note: string, now = Date.now()) {
  return db.transaction(async (tx) => {
    await incidentOfOrg(tx, user.orgId, id);
    if (!note) throw unprocessable("Write the note first.", { note: "Write the note" });
    const [event] = await tx.insert(incidentEvents).values({ incidentId: id, at: now, kind: "note", userId: user.id, detail: note }).returning();
    await audit(tx, { orgId: user.orgId, at: now, userId: user.id, action: "incident.note", entity: "incident", entityId: id });
    return event;
  });
}

/**
 * Acknowledges from a signed mail link: the link's jti is spent in the same transaction, so a
 * link works once. The link's user must still be active and in the incident's organisation.
 */
export async function acknowledgeFromLink(db: Db, link: { jti: string; userId: number; incidentId: number }, now = Date.now()) {
  return db.transaction(async (tx) => {
    const [user] = await tx.select().from(users).where(and(eq(users.id, link.userId), eq(users.active, true)));
    if (!user) throw notFound("The account this link was sent to");
    const spent = await tx.insert(usedTokens).values({ jti: link.jti, usedAt: now }).onConflictDoNothing().returning();
    if (spent.length === 0) throw conflict("This link has already been used.");
    return acknowledgeIn(tx, { id: user.id, orgId: user.orgId }, link.incidentId, undefined, now, "from the e-mail link");
  });
}
