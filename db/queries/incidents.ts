// Reading incidents: the filtered history (page, CSV export) and one incident with its timeline.
// Always scoped to one organisation.
import { and, asc, desc, eq, gte, inArray, lte } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { Db } from "../client";
import { incidentEvents, incidents, sites, tanks, users, type IncidentState } from "../schema";

export interface IncidentFilter {
  siteId?: number;
  tankId?: number;
  cause?: string;
  state?: IncidentState;
  /** Opened at or after / before, ms epoch. */
  from?: number;
  to?: number;
  limit?: number;
}

const ackUser = alias(users, "ack_user");
const resolveUser = alias(users, "resolve_user");

export async function listIncidents(db: Db, orgId: number, f: IncidentFilter = {}) {
  return db
    .select({
      incident: incidents,
      tankName: tanks.name,
      siteName: sites.name,
      acknowledgedByName: ackUser.name,
      resolvedByName: resolveUser.name,
    })
    .from(incidents)
    .innerJoin(tanks, eq(tanks.id, incidents.tankId))
    .innerJoin(sites, eq(sites.id, incidents.siteId))
    .leftJoin(ackUser, eq(ackUser.id, incidents.acknowledgedBy))
    .leftJoin(resolveUser, eq(resolveUser.id, incidents.resolvedBy))
    .where(
      and(
        eq(incidents.orgId, orgId),
        f.siteId ? eq(incidents.siteId, f.siteId) : undefined,
        f.tankId ? eq(incidents.tankId, f.tankId) : undefined,
        f.cause ? eq(incidents.cause, f.cause) : undefined,
        f.state ? eq(incidents.state, f.state) : undefined,
        f.from !== undefined ? gte(incidents.openedAt, f.from) : undefined,
        f.to !== undefined ? lte(incidents.openedAt, f.to) : undefined,
      ),
    )
    .orderBy(desc(incidents.openedAt), desc(incidents.id))
    .limit(f.limit ?? 2000);
}
export type IncidentRow = Awaited<ReturnType<typeof listIncidents>>[number];

/** Sites and tanks of the organisation, for the history's filters. */
export async function incidentFilterOptions(db: Db, orgId: number) {
  const siteRows = await db.select({ id: sites.id, name: sites.name }).from(sites).where(eq(sites.orgId, orgId)).orderBy(sites.name);
  const tankRows = siteRows.length
    ? await db
        .select({ id: tanks.id, name: tanks.name, siteId: tanks.siteId })
        .from(tanks)
        .where(inArray(tanks.siteId, siteRows.map((s) => s.id)))
        .orderBy(tanks.name)
    : [];
  return { sites: siteRows, tanks: tankRows };
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
