import { and, asc, desc, eq } from "drizzle-orm";
import type { Db } from "../client";
import { incidentEvents, incidents, sites, tanks, users } from "../schema";

export async function listIncidents(db: Db, orgId: number, opts: { tankId?: number; limit?: number } = {}) {
  return db
    .select({ incident: incidents, tankName: tanks.name, siteName: sites.name })
    .from(incidents)
    .innerJoin(tanks, eq(tanks.id, incidents.tankId))
    .innerJoin(sites, eq(sites.id, incidents.siteId))
    .where(and(eq(incidents.orgId, orgId), opts.tankId ? eq(incidents.tankId, opts.tankId) : undefined))
    .orderBy(desc(incidents.openedAt))
    .limit(opts.limit ?? 200);
}

export async function incidentWithTimeline(db: Db, orgId: number, id: number) {
  const [row] = await db
    .select({ incident: incidents, tankName: tanks.name, siteName: sites.name })
    .from(incidents)
    .innerJoin(tanks, eq(tanks.id, incidents.tankId))
    .innerJoin(sites, eq(sites.id, incidents.siteId))
    .where(and(eq(incidents.id, id), eq(incidents.orgId, orgId)));
  if (!row) return null;
  const events = await db
    .select({ event: incidentEvents, userName: users.name })
    .from(incidentEvents)
    .leftJoin(users, eq(users.id, incidentEvents.userId))
    .where(eq(incidentEvents.incidentId, id))
    .orderBy(asc(incidentEvents.at), asc(incidentEvents.id));
  return { ...row, events };
}
