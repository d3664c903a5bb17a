import { and, eq } from "drizzle-orm";
import type { Db } from "../client";
import { auditLog, incidentEvents, incidents } from "../schema";
import { conflict, notFound } from "../../app/_server/errors";

/** Acknowledges an open incident of the user's organisation, with an optional note. */
export async function acknowledgeIncident(db: Db, user: { id: number; orgId: number }, id: number, note?: string, now = Date.now()) {
  return db.transaction(async (tx) => {
    const [row] = await tx.select().from(incidents).where(and(eq(incidents.id, id), eq(incidents.orgId, user.orgId)));
    if (!row) throw notFound("That incident");
    if (row.state !== "open") throw conflict(`This incident is already ${row.state}.`);
    const [updated] = await tx
      .update(incidents)
      .set({ state: "acknowledged", acknowledgedAt: now, acknowledgedBy: user.id })
      .where(eq(incidents.id, id))
      .returning();
    await tx.insert(incidentEvents).values({ incidentId: id, at: now, kind: "acknowledged", userId: user.id });
    if (note) await tx.insert(incidentEvents).values({ incidentId: id, at: now, kind: "note", userId: user.id, detail: note });
    await tx.insert(auditLog).values({ orgId: user.orgId, at: now, userId: user.id, action: "incident.acknowledge", entity: "incident", entityId: id });
    return updated;
  });
}
