// Tank controllers and their MQTT credentials. The secret is random, shown once and stored only as a
// bcrypt hash; the broker re-checks devices against this table every few seconds, so a rotation or a
// revocation disconnects a device that is still connected with the old secret.
import { randomBytes } from "node:crypto";
import bcrypt from "bcryptjs";
import { and, asc, desc, eq, isNull, like, or } from "drizzle-orm";
import type { Db } from "../client";
import { devices, sites, tanks } from "../schema";
import { conflict, notFound } from "../../app/_server/errors";
import { audit, type Tx } from "./audit";
import { conflictOn } from "./settings-errors";
import { tankOfOrg } from "./settings-tanks";
import type { Actor } from "./settings-users";

const SECRET_BYTES = 24;
const HASH_COST = 10;

export async function listDevices(db: Db, orgId: number) {
  return db
    .select({
      id: devices.id,
      controllerId: devices.controllerId,
      username: devices.username,
      tankId: devices.tankId,
      tankName: tanks.name,
      siteName: sites.name,
      revokedAt: devices.revokedAt,
      lastSeenAt: devices.lastSeenAt,
      createdAt: devices.createdAt,
    })
    .from(devices)
    .leftJoin(tanks, eq(tanks.id, devices.tankId))
    .leftJoin(sites, eq(sites.id, tanks.siteId))
    .where(eq(devices.orgId, orgId))
    .orderBy(asc(devices.revokedAt), asc(devices.controllerId), desc(devices.createdAt));
}
export type DeviceRow = Awaited<ReturnType<typeof listDevices>>[number];

/** What the owner copies into the controller; the secret is never shown again. */
export interface IssuedCredentials {
  deviceId: number;
  controllerId: string;
  username: string;
  secret: string;
}

async function issueSecret() {
  const secret = randomBytes(SECRET_BYTES).toString("base64url");
  return { secret, secretHash: await bcrypt.hash(secret, HASH_COST) };
}

/** The controller id itself, or `{controllerId}-{n}` when an earlier (revoked) registration holds it. */
async function freeUsername(tx: Tx, controllerId: string) {
  const taken = new Set(
    (await tx.select({ u: devices.username }).from(devices).where(or(eq(devices.username, controllerId), like(devices.username, `${controllerId}-%`)))).map((r) => r.u),
  );
  if (!taken.has(controllerId)) return controllerId;
  let n = 2;
  while (taken.has(`${controllerId}-${n}`)) n++;
  return `${controllerId}-${n}`;
}

export async function registerDevice(db: Db, actor: Actor, input: { tankId: number; controllerId: string }, now = Date.now()): Promise<IssuedCredentials> {
  const { secret, secretHash } = await issueSecret();
  return db.transaction(async (tx) => {
    const tank = await tankOfOrg(tx, actor.orgId, input.tankId);
    if (tank.controllerId) throw conflictOn("tankId", `${tank.name} already has controller ${tank.controllerId}; revoke it first.`);
    const live = await tx.query.devices.findFirst({ where: and(eq(devices.controllerId, input.controllerId), isNull(devices.revokedAt)) });
    const onTank = await tx.query.tanks.findFirst({ where: eq(tanks.controllerId, input.controllerId) });
    if (live || onTank) throw conflictOn("controllerId", `Controller ${input.controllerId} is already registered.`);
    const username = await freeUsername(tx, input.controllerId);
    const [row] = await tx.insert(devices).values({ orgId: actor.orgId, tankId: tank.id, controllerId: input.controllerId, username, secretHash }).returning();
    await tx.update(tanks).set({ controllerId: input.controllerId }).where(eq(tanks.id, tank.id));
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "device.register", entity: "device", entityId: row.id, detail: { controllerId: input.controllerId, username, tank: tank.name } });
    return { deviceId: row.id, controllerId: row.controllerId, username, secret };
  });
}

export async function deviceOfOrg(tx: Tx | Db, orgId: number, id: number) {
  const row = await tx.query.devices.findFirst({ where: and(eq(devices.id, id), eq(devices.orgId, orgId)) });
  if (!row) throw notFound("That device");
  return row;
}

async function liveDeviceOfOrg(tx: Tx, orgId: number, id: number) {
  const row = await deviceOfOrg(tx, orgId, id);
  if (row.revokedAt !== null) throw conflict("These credentials are already revoked; register the controller again to issue new ones.");
  return row;
}

export async function rotateDeviceSecret(db: Db, actor: Actor, id: number, now = Date.now()): Promise<IssuedCredentials> {
  const { secret, secretHash } = await issueSecret();
  return db.transaction(async (tx) => {
    const device = await liveDeviceOfOrg(tx, actor.orgId, id);
    await tx.update(devices).set({ secretHash }).where(eq(devices.id, id));
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "device.rotate", entity: "device", entityId: id, detail: { controllerId: device.controllerId, username: device.username } });
    return { deviceId: id, controllerId: device.controllerId, username: device.username, secret };
  });
}

/** Revokes the credentials and frees the tank for another controller. */
export async function revokeDevice(db: Db, actor: Actor, id: number, now = Date.now()) {
  return db.transaction(async (tx) => {
    const device = await liveDeviceOfOrg(tx, actor.orgId, id);
    const [row] = await tx.update(devices).set({ revokedAt: now }).where(eq(devices.id, id)).returning();
    if (device.tankId !== null) await tx.update(tanks).set({ controllerId: null }).where(and(eq(tanks.id, device.tankId), eq(tanks.controllerId, device.controllerId)));
    await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "device.revoke", entity: "device", entityId: id, detail: { controllerId: device.controllerId, username: device.username } });
    return { id: row.id, controllerId: row.controllerId, revokedAt: row.revokedAt };
  });
}
