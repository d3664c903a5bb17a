// Holds: a tank (or one probe) paused for maintenance. Placing and releasing are audited and
// noted on the tank's open incidents; the dosing commands are sent by the caller after commit.
import { and, eq, isNull, ne } from "drizzle-orm";
import type { Db } from "../client";
import { holds, incidentEvents, incidents, probes, sites, tanks } from "../schema";
import { conflict, notFound, unprocessable } from "../../app/_server/errors";
import { audit, type Tx } from "./audit";

export const DEFAULT_HOLD_MINUTES = 30;

export type Hold = typeof holds.$inferSelect;

export interface HoldTank {
  id: number;
  name: string;
  orgId: number;
  controllerId: string | null;
  maxHoldMinutes: number;
}

async function tankOfOrg(tx: Tx | Db, orgId: number, tankId: number): Promise<HoldTank | null> {
  const [row] = await tx
    .select({ id: tanks.id, name: tanks.name, orgId: sites.orgId, controllerId: tanks.controllerId, maxHoldMinutes: sites.maxHoldMinutes })
    .from(tanks)
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(tanks.id, tankId), eq(sites.orgId, orgId)));
  return row ?? null;
}

async function noteOnOpenIncidents(tx: Tx, tankId: number, at: number, userId: number | null, detail: string) {
  const open = await tx.select({ id: incidents.id }).from(incidents).where(and(eq(incidents.tankId, tankId), ne(incidents.state, "resolved")));
  if (open.length) await tx.insert(incidentEvents).values(open.map((i) => ({ incidentId: i.id, at, kind: "held" as const, userId, detail })));
}

export interface PlaceHoldInput {
  tankId: number;
  probeId?: number | null;
  reason: string;
  minutes: number;
}

export async function placeHold(db: Db, user: { id: number; orgId: number }, input: PlaceHoldInput, now = Date.now()) {
  return db.transaction(async (tx) => {
    const tank = await tankOfOrg(tx, user.orgId, input.tankId);
    if (!tank) throw notFound("That tank");
    if (input.minutes > tank.maxHoldMinutes) {
      throw unprocessable(`A hold at this site lasts at most ${tank.maxHoldMinutes} minutes.`, { minutes: `At most ${tank.maxHoldMinutes} minutes` });
    }
    let probeLabel: string | null = null;
    if (input.probeId) {
      const [probe] = await tx.select().from(probes).where(and(eq(probes.id, input.probeId), eq(probes.tankId, tank.id)));
      if (!probe) throw unprocessable("That probe is not on this tank.", { probeId: "Not a probe of this tank" });
      probeLabel = `${probe.kind.toUpperCase()} probe ${probe.serial}`;
    }
    // One hold at a time per tank, except holds on different single probes.
    const active = await tx.select().from(holds).where(and(eq(holds.tankId, tank.id), isNull(holds.releasedAt)));
    if (active.some((h) => !input.probeId || h.probeId === null || h.probeId === input.probeId)) {
      throw conflict(`${tank.name} is already on hold; release that hold first.`);
    }
    const [hold] = await tx
      .insert(holds)
      .values({ tankId: tank.id, probeId: input.probeId ?? null, reason: input.reason, placedBy: user.id, placedAt: now, plannedEndAt: now + input.minutes * 60_000 })
      .returning();
    await audit(tx, {
      orgId: user.orgId,
      at: now,
      userId: user.id,
      action: "hold.place",
      entity: "hold",
      entityId: hold.id,
      detail: { tank: tank.name, probe: probeLabel, minutes: input.minutes, reason: input.reason },
    });
    await noteOnOpenIncidents(tx, tank.id, now, user.id, `${probeLabel ?? "Tank"} put on hold for ${input.minutes} min: ${input.reason}`);
    return { hold, tank };
  });
}

/** Ends an active hold, by hand (`user`) or on expiry (`user` null). */
export async function releaseHold(db: Db, who: { orgId: number; user: { id: number } | null }, holdId: number, now = Date.now()) {
  return db.transaction(async (tx) => {
    const [row] = await tx.select().from(holds).where(eq(holds.id, holdId));
    const tank = row ? await tankOfOrg(tx, who.orgId, row.tankId) : null;
    if (!row || !tank) throw notFound("That hold");
    if (row.releasedAt !== null) throw conflict("That hold has already ended.");
    const releaseKind = who.user ? "manual" : "expired";
    const [hold] = await tx
      .update(holds)
      .set({ releasedAt: now, releasedBy: who.user?.id ?? null, releaseKind })
      .where(and(eq(holds.id, holdId), isNull(holds.releasedAt)))
      .returning();
    await audit(tx, {
      orgId: who.orgId,
      at: now,
      userId: who.user?.id ?? null,
      action: who.user ? "hold.release" : "hold.expire",
      entity: "hold",
      entityId: hold.id,
      detail: { tank: tank.name, heldMinutes: Math.round((now - row.placedAt) / 60_000) },
    });
    await noteOnOpenIncidents(tx, tank.id, now, who.user?.id ?? null, who.user ? "Hold released by hand; alerts return after settling" : "Hold expired at the site's maximum length; alerts return after settling");
    return { hold, tank };
  });
}

/** Records that a dosing command reached the broker, so nobody sends it again. */
export async function markDosingSent(db: Db, holdId: number, command: "inhibit" | "resume", at: number) {
  await db
    .update(holds)
    .set(command === "inhibit" ? { dosingInhibitSentAt: at } : { dosingResumeSentAt: at })
    .where(eq(holds.id, holdId));
}
