// Calibration compliance per site, for the owner: the share of probes in date, the overdue list,
// runs per month and rejected runs.
import { and, desc, eq, gte, inArray, ne } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationRuns, probes, sites, tanks } from "../schema";
import { tankOverview } from "./overview";

const MONTHS = 6;

function monthKey(ms: number) {
  return new Date(ms).toISOString().slice(0, 7);
}

export async function calibrationCompliance(db: Db, orgId: number, now = Date.now()) {
  const overview = await tankOverview(db, orgId, { now });
  const siteRows = await db.select().from(sites).where(eq(sites.orgId, orgId)).orderBy(sites.name);
  const start = new Date(now);
  start.setUTCDate(1);
  start.setUTCHours(0, 0, 0, 0);
  start.setUTCMonth(start.getUTCMonth() - (MONTHS - 1));
  const months = Array.from({ length: MONTHS }, (_, i) => {
    const d = new Date(start);
    d.setUTCMonth(d.getUTCMonth() + i);
    return monthKey(d.getTime());
  });

  const runs = siteRows.length
    ? await db
        .select({ run: calibrationRuns, siteId: tanks.siteId, tankName: tanks.name, serial: probes.serial, kind: probes.kind })
        .from(calibrationRuns)
        .innerJoin(tanks, eq(tanks.id, calibrationRuns.tankId))
        .innerJoin(probes, eq(probes.id, calibrationRuns.probeId))
        .where(and(inArray(tanks.siteId, siteRows.map((s) => s.id)), gte(calibrationRuns.startedAt, start.getTime()), ne(calibrationRuns.status, "in_progress")))
        .orderBy(desc(calibrationRuns.startedAt))
    : [];

  return siteRows.map((site) => {
    const siteTanks = overview.filter((t) => t.siteId === site.id);
    const siteProbes = siteTanks.flatMap((t) => t.probes.filter((p) => p.kind !== "temp").map((p) => ({ tank: t, probe: p })));
    const inDate = siteProbes.filter((p) => p.probe.calibration.status === "current" || p.probe.calibration.status === "due-soon");
    const siteRuns = runs.filter((r) => r.siteId === site.id);
    return {
      site: { id: site.id, name: site.name, maxCalibrationIntervalDays: site.maxCalibrationIntervalDays },
      probes: siteProbes.length,
      inDate: inDate.length,
      sharePct: siteProbes.length ? (inDate.length / siteProbes.length) * 100 : null,
      overdue: siteProbes
        .filter((p) => p.probe.calibration.status === "lapsed" || p.probe.calibration.status === "never")
        .map((p) => ({ tankId: p.tank.id, tankName: p.tank.name, probeId: p.probe.id, kind: p.probe.kind, serial: p.probe.serial, status: p.probe.calibration.status, dueAt: p.probe.calibration.dueAt })),
      perMonth: months.map((m) => {
        const inMonth = siteRuns.filter((r) => monthKey(r.run.startedAt) === m);
        return { month: m, accepted: inMonth.filter((r) => r.run.status === "accepted").length, rejected: inMonth.filter((r) => r.run.status === "rejected").length };
      }),
      rejected: siteRuns
        .filter((r) => r.run.status === "rejected")
        .slice(0, 20)
        .map((r) => ({ id: r.run.id, at: r.run.completedAt ?? r.run.startedAt, tankName: r.tankName, serial: r.serial, kind: r.kind, probeId: r.run.probeId, reasons: r.run.reasons })),
    };
  });
}
export type SiteCompliance = Awaited<ReturnType<typeof calibrationCompliance>>[number];
