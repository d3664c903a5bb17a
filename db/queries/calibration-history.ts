// A probe's calibration record: every run with its points, the status now, the drift rate from
// as-found checks and the suggested next due date, spot checks and the probe's lifecycle.
import { asc, desc, eq, inArray, or } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationPoints, calibrationRuns, probes, uploads, users } from "../schema";
import { DAY_MS, calibrationStatus, suggestNextDue, type AsFoundError, type CalibrationStatus } from "../../lib/calibration";
import { probeInOrg } from "./calibration-scope";

/** Projected as-found error at which a probe is due: 0.1 pH (as lib/calibration) or 5 % EC (Tidewell choice). */
export const DRIFT_TOLERANCE = { ph: 0.1, ec: 5 } as const;

export async function probeRecord(db: Db, orgId: number, probeId: number, now = Date.now()) {
  const { probe, tank, site } = await probeInOrg(db, orgId, probeId);
  const runs = await db
    .select({ run: calibrationRuns, userName: users.name, upload: { id: uploads.id, filename: uploads.filename } })
    .from(calibrationRuns)
    .leftJoin(users, eq(users.id, calibrationRuns.startedBy))
    .leftJoin(uploads, eq(uploads.id, calibrationRuns.uploadId))
    .where(eq(calibrationRuns.probeId, probe.id))
    .orderBy(desc(calibrationRuns.startedAt), desc(calibrationRuns.id));
  const points = runs.length
    ? await db.select().from(calibrationPoints).where(inArray(calibrationPoints.runId, runs.map((r) => r.run.id))).orderBy(asc(calibrationPoints.seq))
    : [];

  const intervalDays = Math.min(tank.calibrationIntervalDays, site.maxCalibrationIntervalDays);
  const accepted = runs.filter((r) => r.run.status === "accepted" && r.run.effectiveAt !== null && r.run.effectiveAt <= now).map((r) => r.run);
  const acceptedAsc = [...accepted].sort((a, b) => a.effectiveAt! - b.effectiveAt!);
  const last = acceptedAsc.at(-1) ?? null;
  const status: CalibrationStatus | "not-needed" = probe.kind === "temp" ? "not-needed" : calibrationStatus({ lastAcceptedAt: last?.effectiveAt ?? null, intervalDays, now });

  // Each accepted run's as-found error measures the drift of the calibration before it.
  const asFound: AsFoundError[] = [];
  for (const run of acceptedAsc) {
    const error = probe.kind === "ph" ? run.asFoundErrorPh : run.asFoundErrorPct;
    const before = acceptedAsc.filter((r) => r.effectiveAt! < run.effectiveAt!).at(-1);
    if (error === null || !before) continue;
    const check = points.find((p) => p.runId === run.id && p.purpose === "as_found");
    asFound.push({ at: check?.capturedAt ?? run.startedAt, errorPh: error, previousCalibratedAt: before.effectiveAt! });
  }
  const next =
    last && probe.kind !== "temp"
      ? suggestNextDue({ lastCalibratedAt: last.effectiveAt!, asFoundErrors: asFound, maxIntervalDays: intervalDays, tolerancePh: DRIFT_TOLERANCE[probe.kind] })
      : null;

  const related = await db
    .select()
    .from(probes)
    .where(or(eq(probes.replacedById, probe.id), probe.replacedById ? eq(probes.id, probe.replacedById) : undefined));

  return {
    probe,
    tank: { id: tank.id, name: tank.name, crop: tank.crop },
    site: { id: site.id, name: site.name, maxCalibrationIntervalDays: site.maxCalibrationIntervalDays },
    intervalDays,
    status,
    lastAccepted: last,
    dueAt: last?.effectiveAt ? last.effectiveAt + intervalDays * DAY_MS : null,
    drift: next ? { ratePerDay: next.driftPhPerDay, unit: probe.kind === "ph" ? "pH" : "%", suggestedDueAt: next.nextDueAt, checks: asFound.length } : null,
    runs: runs.map((r) => ({ ...r.run, userName: r.userName, upload: r.upload?.id ? r.upload : null, points: points.filter((p) => p.runId === r.run.id) })),
    replacedBy: related.find((p) => p.id === probe.replacedById) ?? null,
    replaces: related.filter((p) => p.replacedById === probe.id),
  };
}
export type ProbeRecord = Awaited<ReturnType<typeof probeRecord>>;

