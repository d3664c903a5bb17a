// What the tank wall and the tanks list show: each tank with its latest readings,
// calibration status per probe, active hold and open incidents. Scoped to one organisation.
import { and, eq, inArray, isNull, ne, sql } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationRuns, holds, incidents, probes, sites, tanks, zones, type ProbeKind, type QualityFlag } from "../schema";
import { calibrationStatus, type CalibrationStatus } from "../../lib/calibration";

export interface ProbeOverview {
  id: number;
  kind: ProbeKind;
  serial: string;
  status: "active" | "replace" | "retired";
  latest: { ts: number; value: number | null; quality: QualityFlag } | null;
  calibration: { status: CalibrationStatus | "not-needed"; lastAcceptedAt: number | null; dueAt: number | null };
}

export interface TankOverview {
  id: number;
  name: string;
  crop: string;
  siteId: number;
  siteName: string;
  zoneName: string | null;
  band: { phMin: number; phMax: number; ecMinUs: number; ecMaxUs: number; tempMin: number; tempMax: number };
  probes: ProbeOverview[];
  hold: { id: number; reason: string; placedAt: number; plannedEndAt: number } | null;
  openIncidents: { id: number; cause: string; state: "open" | "acknowledged"; message: string; openedAt: number }[];
}

export async function tankOverview(db: Db, orgId: number, opts: { siteId?: number; tankId?: number; now?: number } = {}): Promise<TankOverview[]> {
  const now = opts.now ?? Date.now();
  const tankRows = await db
    .select({ tank: tanks, siteName: sites.name, zoneName: zones.name, interval: sites.maxCalibrationIntervalDays })
    .from(tanks)
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .leftJoin(zones, eq(zones.id, tanks.zoneId))
    .where(
      and(
        eq(sites.orgId, orgId),
        opts.siteId ? eq(tanks.siteId, opts.siteId) : undefined,
        opts.tankId ? eq(tanks.id, opts.tankId) : undefined,
      ),
    )
    .orderBy(sites.name, tanks.name);
  if (tankRows.length === 0) return [];
  const tankIds = tankRows.map((r) => r.tank.id);

  const probeRows = await db
    .select()
    .from(probes)
    .where(and(inArray(probes.tankId, tankIds), ne(probes.status, "retired")));
  const probeIds = probeRows.map((p) => p.id);

  const latestRows = probeIds.length
    ? await db.all<{ probe_id: number; ts: number; value: number | null; quality: QualityFlag }>(sql`
        SELECT r.probe_id, r.ts, r.value, r.quality FROM readings r
        WHERE r.probe_id IN (${sql.join(probeIds, sql`, `)})
          AND r.ts = (SELECT max(ts) FROM readings WHERE probe_id = r.probe_id)`)
    : [];
  const latest = new Map(latestRows.map((r) => [r.probe_id, r]));

  const lastAccepted = probeIds.length
    ? await db
        .select({ probeId: calibrationRuns.probeId, at: sql<number>`max(${calibrationRuns.effectiveAt})` })
        .from(calibrationRuns)
        .where(and(inArray(calibrationRuns.probeId, probeIds), eq(calibrationRuns.status, "accepted")))
        .groupBy(calibrationRuns.probeId)
    : [];
  const acceptedAt = new Map(lastAccepted.map((r) => [r.probeId, r.at]));

  const activeHolds = await db
    .select()
    .from(holds)
    .where(and(inArray(holds.tankId, tankIds), isNull(holds.releasedAt)));
  const openRows = await db
    .select()
    .from(incidents)
    .where(and(inArray(incidents.tankId, tankIds), ne(incidents.state, "resolved")));

  return tankRows.map(({ tank, siteName, zoneName, interval }) => {
    const intervalDays = Math.min(tank.calibrationIntervalDays, interval);
    const hold = activeHolds.find((h) => h.tankId === tank.id && h.plannedEndAt > 0) ?? null;
    return {
      id: tank.id,
      name: tank.name,
      crop: tank.crop,
      siteId: tank.siteId,
      siteName,
      zoneName,
      band: { phMin: tank.phMin, phMax: tank.phMax, ecMinUs: tank.ecMinUs, ecMaxUs: tank.ecMaxUs, tempMin: tank.tempMin, tempMax: tank.tempMax },
      probes: probeRows
        .filter((p) => p.tankId === tank.id)
        .sort((a, b) => order(a.kind) - order(b.kind))
        .map((p) => {
          const last = acceptedAt.get(p.id) ?? null;
          const l = latest.get(p.id);
          return {
            id: p.id,
            kind: p.kind,
            serial: p.serial,
            status: p.status,
            latest: l ? { ts: l.ts, value: l.value, quality: l.quality } : null,
            calibration:
              p.kind === "temp"
                ? { status: "not-needed" as const, lastAcceptedAt: null, dueAt: null }
                : { status: calibrationStatus({ lastAcceptedAt: last, intervalDays, now }), lastAcceptedAt: last, dueAt: last === null ? null : last + intervalDays * 86_400_000 },
          };
        }),
      hold: hold ? { id: hold.id, reason: hold.reason, placedAt: hold.placedAt, plannedEndAt: hold.plannedEndAt } : null,
      openIncidents: openRows
        .filter((i) => i.tankId === tank.id)
        .map((i) => ({ id: i.id, cause: i.cause, state: i.state as "open" | "acknowledged", message: i.message, openedAt: i.openedAt })),
    };
  });
}

function order(kind: ProbeKind) {
  return kind === "ph" ? 0 : kind === "ec" ? 1 : 2;
}
