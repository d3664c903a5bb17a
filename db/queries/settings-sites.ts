// The organisation, its sites (time zone, shift hours, limits) and their zones.
import { and, asc, count, eq, gt } from "drizzle-orm";
import type { z } from "zod";
import type { Db } from "../client";
import { organisations, sites, tanks, zones } from "../schema";
import { conflict, notFound } from "../../app/_server/errors";
import type { organisationSchema, siteSchema } from "../../lib/settings/schemas";
import { audit, changedFields, type Tx } from "./audit";
import type { Actor } from "./settings-users";

export async function getOrganisation(db: Db, orgId: number) {
  const org = await db.query.organisations.findFirst({ where: eq(organisations.id, orgId) });
  if (!org) throw notFound("Your organisation");
  return org;
}

export async function renameOrganisation(db: Db, actor: Actor, input: z.output<typeof organisationSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const before = await tx.query.organisations.findFirst({ where: eq(organisations.id, actor.orgId) });
    if (!before) throw notFound("Your organisation");
    const [after] = await tx.update(organisations).set({ name: input.name }).where(eq(organisations.id, actor.orgId)).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "organisation.update", entity: "organisation", entityId: actor.orgId, detail: { changed: changedFields(before, input) } });
    return after;
  });
}

export async function listSites(db: Db, orgId: number) {
  const siteRows = await db.select().from(sites).where(eq(sites.orgId, orgId)).orderBy(asc(sites.name));
  const zoneRows = await db
    .select({ zone: zones, tanks: count(tanks.id) })
    .from(zones)
    .innerJoin(sites, eq(sites.id, zones.siteId))
    .leftJoin(tanks, eq(tanks.zoneId, zones.id))
    .where(eq(sites.orgId, orgId))
    .groupBy(zones.id)
    .orderBy(asc(zones.name));
  return siteRows.map((s) => ({ ...s, zones: zoneRows.filter((z) => z.zone.siteId === s.id).map((z) => ({ ...z.zone, tankCount: z.tanks })) }));
}
export type SiteRow = Awaited<ReturnType<typeof listSites>>[number];

export async function siteOfOrg(tx: Tx | Db, orgId: number, siteId: number) {
  const site = await tx.query.sites.findFirst({ where: and(eq(sites.id, siteId), eq(sites.orgId, orgId)) });
  if (!site) throw notFound("That site");
  return site;
}

export async function createSite(db: Db, actor: Actor, input: z.output<typeof siteSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(sites).values({ ...input, orgId: actor.orgId }).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "site.create", entity: "site", entityId: row.id, detail: { name: row.name, timeZone: row.timeZone } });
    return row;
  });
}

/** Updates a site; lowering its maximum calibration interval brings longer tank intervals down to it. */
export async function updateSite(db: Db, actor: Actor, id: number, input: z.output<typeof siteSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const before = await siteOfOrg(tx, actor.orgId, id);
    const [after] = await tx.update(sites).set(input).where(eq(sites.id, id)).returning();
    const clamped = await tx
      .update(tanks)
      .set({ calibrationIntervalDays: input.maxCalibrationIntervalDays })
      .where(and(eq(tanks.siteId, id), gt(tanks.calibrationIntervalDays, input.maxCalibrationIntervalDays)))
      .returning({ id: tanks.id, name: tanks.name });
    await audit(tx, {
      orgId: actor.orgId,
      userId: actor.id,
      at: now,
      action: "site.update",
      entity: "site",
      entityId: id,
      detail: { name: after.name, changed: changedFields(before, input), ...(clamped.length ? { tanksIntervalLowered: clamped.map((t) => t.name) } : {}) },
    });
    return after;
  });
}

export async function createZone(db: Db, actor: Actor, siteId: number, name: string, now = Date.now()) {
  return db.transaction(async (tx) => {
    const site = await siteOfOrg(tx, actor.orgId, siteId);
    const [row] = await tx.insert(zones).values({ siteId, name }).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "zone.create", entity: "zone", entityId: row.id, detail: { name, site: site.name } });
    return row;
  });
}

export async function zoneOfOrg(tx: Tx | Db, orgId: number, id: number) {
  const [row] = await tx
    .select({ zone: zones })
    .from(zones)
    .innerJoin(sites, eq(sites.id, zones.siteId))
    .where(and(eq(zones.id, id), eq(sites.orgId, orgId)));
  if (!row) throw notFound("That zone");
  return row.zone;
}

export async function renameZone(db: Db, actor: Actor, id: number, name: string, now = Date.now()) {
  return db.transaction(async (tx) => {
    const before = await zoneOfOrg(tx, actor.orgId, id);
    const [after] = await tx.update(zones).set({ name }).where(eq(zones.id, id)).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "zone.update", entity: "zone", entityId: id, detail: { changed: { name: [before.name, name] } } });
    return after;
  });
}

export async function deleteZone(db: Db, actor: Actor, id: number, now = Date.now()) {
  return db.transaction(async (tx) => {
    const zone = await zoneOfOrg(tx, actor.orgId, id);
    const [{ n }] = await tx.select({ n: count() }).from(tanks).where(eq(tanks.zoneId, id));
    if (n > 0) throw conflict(`This zone still has ${n} tank${n === 1 ? "" : "s"}; move them to another zone first.`);
    await tx.delete(zones).where(eq(zones.id, id));
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "zone.delete", entity: "zone", entityId: id, detail: { name: zone.name } });
    return zone;
  });
}
