// Probes: add, move between tanks, retire, replace. A probe is never deleted; a replaced probe is
// retired with `replaced_by_id` pointing at its successor, so every calibration keeps its probe.
import { and, asc, eq, ne } from "drizzle-orm";
import type { z } from "zod";
import type { Db } from "../client";
import { probes, sites, tanks, type ProbeKind } from "../schema";
import { conflict, notFound } from "../../app/_server/errors";
import { PROBE_KIND_NAMES } from "../../lib/settings/enums";
import type { probeSchema, replaceProbeSchema } from "../../lib/settings/schemas";
import { audit, type Tx } from "./audit";
import { conflictOn, unprocessableOn } from "./settings-errors";
import { tankOfOrg } from "./settings-tanks";
import type { Actor } from "./settings-users";

export async function listProbeSettings(db: Db, orgId: number) {
  return db
    .select({ probe: probes, tankName: tanks.name, siteName: sites.name })
    .from(probes)
    .innerJoin(tanks, eq(tanks.id, probes.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(eq(sites.orgId, orgId))
    .orderBy(asc(sites.name), asc(tanks.name), asc(probes.kind), asc(probes.installedAt));
}
export type ProbeSettingsRow = Awaited<ReturnType<typeof listProbeSettings>>[number];

export async function probeOfOrg(tx: Tx | Db, orgId: number, id: number) {
  const [row] = await tx
    .select({ probe: probes })
    .from(probes)
    .innerJoin(tanks, eq(tanks.id, probes.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(probes.id, id), eq(sites.orgId, orgId)));
  if (!row) throw notFound("That probe");
  return row.probe;
}

async function serialFree(tx: Tx, serial: string) {
  const taken = await tx.query.probes.findFirst({ where: eq(probes.serial, serial) });
  if (taken) throw conflictOn("serial", `A probe with serial ${serial} is already recorded.`);
}

/** One working probe per measure per tank: the ingest and the tank wall read one pH, one EC, one temperature. */
async function kindFree(tx: Tx, tankId: number, kind: ProbeKind, field: string, except?: number) {
  const present = await tx.query.probes.findFirst({
    where: and(eq(probes.tankId, tankId), eq(probes.kind, kind), ne(probes.status, "retired"), except ? ne(probes.id, except) : undefined),
  });
  if (present) throw conflictOn(field, `That tank already has a ${PROBE_KIND_NAMES[kind]} probe (${present.serial}); replace or move it first.`);
}

export async function addProbe(db: Db, actor: Actor, input: z.output<typeof probeSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const tank = await tankOfOrg(tx, actor.orgId, input.tankId);
    await serialFree(tx, input.serial);
    await kindFree(tx, tank.id, input.kind, "kind");
    const [row] = await tx.insert(probes).values({ ...input, installedAt: now }).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "probe.add", entity: "probe", entityId: row.id, detail: { serial: row.serial, kind: row.kind, tank: tank.name } });
    return row;
  });
}

export async function moveProbe(db: Db, actor: Actor, id: number, tankId: number, now = Date.now()) {
  return db.transaction(async (tx) => {
    const probe = await probeOfOrg(tx, actor.orgId, id);
    if (probe.status === "retired") throw conflict("A retired probe cannot be moved.");
    if (probe.tankId === tankId) throw unprocessableOn("tankId", "The probe is already in that tank.");
    const from = await tankOfOrg(tx, actor.orgId, probe.tankId);
    const to = await tankOfOrg(tx, actor.orgId, tankId).catch(() => {
      throw unprocessableOn("tankId", "Choose one of your tanks.");
    });
    await kindFree(tx, to.id, probe.kind, "tankId", probe.id);
    const [row] = await tx.update(probes).set({ tankId }).where(eq(probes.id, id)).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "probe.move", entity: "probe", entityId: id, detail: { serial: probe.serial, from: from.name, to: to.name } });
    return row;
  });
}

export async function retireProbe(db: Db, actor: Actor, id: number, now = Date.now()) {
  return db.transaction(async (tx) => {
    const probe = await probeOfOrg(tx, actor.orgId, id);
    if (probe.status === "retired") throw conflict("This probe is already retired.");
    const [row] = await tx.update(probes).set({ status: "retired", retiredAt: now }).where(eq(probes.id, id)).returning();
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "probe.retire", entity: "probe", entityId: id, detail: { serial: probe.serial, kind: probe.kind } });
    return row;
  });
}

/** Retires the probe and installs its successor in the same tank, linking the two. */
export async function replaceProbe(db: Db, actor: Actor, id: number, input: z.output<typeof replaceProbeSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const old = await probeOfOrg(tx, actor.orgId, id);
    if (old.status === "retired") throw conflict("This probe is already retired; add a new probe to the tank instead.");
    if (old.kind === "ec" && input.nominalCellConstant === null) throw unprocessableOn("nominalCellConstant", "An EC probe needs its nominal cell constant.");
    if (old.kind !== "ec" && input.nominalCellConstant !== null) throw unprocessableOn("nominalCellConstant", "Only EC probes have a cell constant.");
    await serialFree(tx, input.serial);
    const [successor] = await tx
      .insert(probes)
      .values({ tankId: old.tankId, kind: old.kind, serial: input.serial, nominalCellConstant: input.nominalCellConstant, installedAt: now })
      .returning();
    await tx.update(probes).set({ status: "retired", retiredAt: now, replacedById: successor.id }).where(eq(probes.id, id));
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "probe.replace", entity: "probe", entityId: id, detail: { serial: old.serial, kind: old.kind, replacedBy: successor.serial } });
    return successor;
  });
}
