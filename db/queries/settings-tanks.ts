// Tanks as settings: crop and target bands, temperature coefficient, spot-check tolerances and the
// calibration interval (never above the site's maximum).
import { and, asc, eq } from "drizzle-orm";
import type { z } from "zod";
import type { Db } from "../client";
import { sites, tanks, zones } from "../schema";
import { notFound } from "../../app/_server/errors";
import type { tankSchema } from "../../lib/settings/schemas";
import { audit, changedFields, type Tx } from "./audit";
import { unprocessableOn } from "./settings-errors";
import { siteOfOrg } from "./settings-sites";
import type { Actor } from "./settings-users";

type TankValues = z.output<typeof tankSchema>;

export async function listTankSettings(db: Db, orgId: number) {
  return db
    .select({ tank: tanks, siteName: sites.name, zoneName: zones.name, siteMaxInterval: sites.maxCalibrationIntervalDays })
    .from(tanks)
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .leftJoin(zones, eq(zones.id, tanks.zoneId))
    .where(eq(sites.orgId, orgId))
    .orderBy(asc(sites.name), asc(tanks.name));
}
export type TankSettingsRow = Awaited<ReturnType<typeof listTankSettings>>[number];

export async function tankOfOrg(tx: Tx | Db, orgId: number, id: number) {
  const [row] = await tx
    .select({ tank: tanks })
    .from(tanks)
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(tanks.id, id), eq(sites.orgId, orgId)));
  if (!row) throw notFound("That tank");
  return row.tank;
}

/** Checks the site, zone and interval against the site's own settings. */
async function checkPlacement(tx: Tx, orgId: number, input: TankValues) {
  const site = await siteOfOrg(tx, orgId, input.siteId);
  if (input.zoneId !== null) {
    const zone = await tx.query.zones.findFirst({ where: and(eq(zones.id, input.zoneId), eq(zones.siteId, site.id)) });
    if (!zone) throw unprocessableOn("zoneId", "Choose a zone of the chosen site.");
  }
  if (input.calibrationIntervalDays > site.maxCalibrationIntervalDays) {
    throw unprocessableOn("calibrationIntervalDays", `${site.name} allows at most ${site.maxCalibrationIntervalDays} days between calibrations.`);
  }
  return site;
}

export async function createTank(db: Db, actor: Actor, input: TankValues, now = Date.now()) {
  return db.transaction(async (tx) => {
    const site = await checkPlacement(tx, actor.orgId, input);
    const [row] = await tx.insert(tanks).values(input).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "tank.create", entity: "tank", entityId: row.id, detail: { name: row.name, site: site.name, crop: row.crop } });
    return row;
  });
}

export async function updateTank(db: Db, actor: Actor, id: number, input: TankValues, now = Date.now()) {
  return db.transaction(async (tx) => {
    const before = await tankOfOrg(tx, actor.orgId, id);
    await checkPlacement(tx, actor.orgId, input);
    const [after] = await tx.update(tanks).set(input).where(eq(tanks.id, id)).returning();
    const changed = changedFields(before, input);
    if (Object.keys(changed).length) await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "tank.update", entity: "tank", entityId: id, detail: { name: after.name, changed } });
    return after;
  });
}
