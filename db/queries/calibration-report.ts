// What a site's calibration report states: the compliance of its pH and EC probes now, the
// overdue ones, the probes marked for replacement, and the runs finished in a period.
import { and, asc, eq, gte, lt, ne } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationRuns, organisations, probes, sites, tanks, users } from "../schema";
import { notFound } from "../../app/_server/errors";
import { tankOverview } from "./overview";
import type { ReportPeriod } from "../../lib/reports/format";

export async function siteReportData(db: Db, orgId: number, siteId: number, period: ReportPeriod, now: number) {
  const [site] = await db.select().from(sites).where(and(eq(sites.id, siteId), eq(sites.orgId, orgId)));
  if (!site) throw notFound("That site");
  const [org] = await db.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, orgId));
  const overview = await tankOverview(db, orgId, { siteId, now });
  const calibrated = overview.flatMap((t) => t.probes.filter((p) => p.kind !== "temp").map((p) => ({ tank: t, probe: p })));
  const byStatus = { current: 0, "due-soon": 0, lapsed: 0, never: 0 };
  for (const { probe } of calibrated) if (probe.calibration.status in byStatus) byStatus[probe.calibration.status as keyof typeof byStatus]++;
  const inDate = byStatus.current + byStatus["due-soon"];

  const runs = await db
    .select({ run: calibrationRuns, tankName: tanks.name, serial: probes.serial, kind: probes.kind, userName: users.name })
    .from(calibrationRuns)
    .innerJoin(tanks, eq(tanks.id, calibrationRuns.tankId))
    .innerJoin(probes, eq(probes.id, calibrationRuns.probeId))
    .leftJoin(users, eq(users.id, calibrationRuns.startedBy))
    .where(and(eq(tanks.siteId, siteId), gte(calibrationRuns.startedAt, period.startMs), lt(calibrationRuns.startedAt, period.endMs), ne(calibrationRuns.status, "in_progress")))
    .orderBy(asc(calibrationRuns.startedAt), asc(calibrationRuns.id));

  return {
    org: { name: org?.name ?? "" },
    site: { id: site.id, name: site.name, timeZone: site.timeZone, maxCalibrationIntervalDays: site.maxCalibrationIntervalDays },
    tanks: overview.length,
    probes: calibrated.length,
    byStatus,
    inDate,
    sharePct: calibrated.length ? (inDate / calibrated.length) * 100 : null,
    overdue: calibrated
      .filter((p) => p.probe.calibration.status === "lapsed" || p.probe.calibration.status === "never")
      .map((p) => ({ probeId: p.probe.id, tankName: p.tank.name, kind: p.probe.kind, serial: p.probe.serial, status: p.probe.calibration.status, lastAcceptedAt: p.probe.calibration.lastAcceptedAt, dueAt: p.probe.calibration.dueAt })),
    forReplacement: calibrated.filter((p) => p.probe.status === "replace").map((p) => ({ probeId: p.probe.id, tankName: p.tank.name, kind: p.probe.kind, serial: p.probe.serial })),
    perMonth: monthsOf(period).map((month) => {
      const inMonth = runs.filter((r) => new Date(r.run.startedAt).toISOString().slice(0, 7) === month);
      return { month, accepted: inMonth.filter((r) => r.run.status === "accepted").length, rejected: inMonth.filter((r) => r.run.status === "rejected").length, abandoned: inMonth.filter((r) => r.run.status === "abandoned").length };
    }),
    runs: runs.map((r) => ({ ...r.run, tankName: r.tankName, serial: r.serial, kind: r.kind, userName: r.userName })),
  };
}
export type SiteReportData = Awaited<ReturnType<typeof siteReportData>>;

/** The calendar months (UTC, YYYY-MM) the period touches. */
export function monthsOf(period: ReportPeriod): string[] {
  const out: string[] = [];
  const d = new Date(`${period.from.slice(0, 7)}-01T00:00:00Z`);
  while (d.getTime() < period.endMs) {
    out.push(d.toISOString().slice(0, 7));
    d.setUTCMonth(d.getUTCMonth() + 1);
  }
  return out;
}
