// Finding a probe or a calibration run inside the user's organisation, and the calibration in
// force on a probe. Every calibration query starts here, so nothing crosses organisations.
import { and, desc, eq, isNotNull, lte, ne } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationRuns, probes, sites, tanks } from "../schema";
import { notFound } from "../../app/_server/errors";

export type ProbeRow = typeof probes.$inferSelect;
export type TankRow = typeof tanks.$inferSelect;
export type SiteRow = typeof sites.$inferSelect;
export type RunRow = typeof calibrationRuns.$inferSelect;

export interface ProbeScope {
  probe: ProbeRow;
  tank: TankRow;
  site: SiteRow;
}

/** The probe with its tank and site, or 404 when it is not in this organisation. */
export async function probeInOrg(db: Db, orgId: number, probeId: number): Promise<ProbeScope> {
  const [row] = await db
    .select({ probe: probes, tank: tanks, site: sites })
    .from(probes)
    .innerJoin(tanks, eq(tanks.id, probes.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(probes.id, probeId), eq(sites.orgId, orgId)));
  if (!row) throw notFound("That probe");
  return row;
}

/** The run with its probe, tank and site, or 404 when it is not in this organisation. */
export async function runInOrg(db: Db, orgId: number, runId: number): Promise<ProbeScope & { run: RunRow }> {
  const [row] = await db
    .select({ run: calibrationRuns, probe: probes, tank: tanks, site: sites })
    .from(calibrationRuns)
    .innerJoin(probes, eq(probes.id, calibrationRuns.probeId))
    .innerJoin(tanks, eq(tanks.id, calibrationRuns.tankId))
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .where(and(eq(calibrationRuns.id, runId), eq(sites.orgId, orgId)));
  if (!row) throw notFound("That calibration run");
  return row;
}

/** The accepted calibration in force on a probe at a time (the latest effective at or before it). */
export async function calibrationInForce(db: Db, probeId: number, at: number): Promise<RunRow | null> {
  const [row] = await db
    .select()
    .from(calibrationRuns)
    .where(and(eq(calibrationRuns.probeId, probeId), eq(calibrationRuns.status, "accepted"), isNotNull(calibrationRuns.effectiveAt), lte(calibrationRuns.effectiveAt, at)))
    .orderBy(desc(calibrationRuns.effectiveAt), desc(calibrationRuns.id))
    .limit(1);
  return row ?? null;
}

/** The tank's temperature probe (not retired), whose reading a calibration point uses. */
export async function temperatureProbeOf(db: Db, tankId: number): Promise<ProbeRow | null> {
  const [row] = await db
    .select()
    .from(probes)
    .where(and(eq(probes.tankId, tankId), eq(probes.kind, "temp"), ne(probes.status, "retired")))
    .limit(1);
  return row ?? null;
}

/** The UTC calendar day of a time, YYYY-MM-DD, to compare with a buffer's expiry date. */
export function utcDay(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}
