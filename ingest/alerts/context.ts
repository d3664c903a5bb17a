// Everything the rule engine needs to know about tanks that is not in the reading itself:
// target bands (EC converted to mS/cm for lib/alerts), rules, calibration record, holds.
import { and, desc, inArray, isNull, ne, sql } from "drizzle-orm";
import type { Db } from "../../db/client";
import { alertRules, calibrationRuns, holds, probes, sites, tanks, type ProbeKind } from "../../db/schema";
import { calibrationStatusAt, type Band, type ProbeCalibrationInfo, type RuleSettings } from "../../lib/alerts";
import type { ShiftSite } from "./shifts";
import { tankRules, type TankRules } from "./rule-settings";

const DAY_MS = 86_400_000;

export interface SiteContext extends ShiftSite {
  id: number;
  orgId: number;
  name: string;
  escalateAfterMinutes: number;
  maxHoldMinutes: number;
}

export interface ProbeContext {
  id: number;
  kind: ProbeKind;
  serial: string;
  tankId: number;
  /** Last accepted calibration and the run history, as of loading. */
  lastAcceptedAt: number | null;
  lastRunRejected: boolean;
  consecutiveRejections: number;
  lastRejectionReasons: string[];
}

export interface TankContext extends TankRules {
  id: number;
  orgId: number;
  name: string;
  controllerId: string | null;
  site: SiteContext;
  band: Record<"ph" | "ec" | "temp", Band>;
  intervalDays: number;
  probes: ProbeContext[];
}

export interface AlertContext {
  tanks: Map<number, TankContext>;
  probes: Map<number, ProbeContext>;
  loadedAt: number;
}

export async function loadContext(db: Db, now: number): Promise<AlertContext> {
  const siteRows = await db.select().from(sites);
  const siteById = new Map<number, SiteContext>(
    siteRows.map((s) => [
      s.id,
      {
        id: s.id,
        orgId: s.orgId,
        name: s.name,
        timeZone: s.timeZone,
        dayStartHour: s.dayStartHour,
        nightStartHour: s.nightStartHour,
        dayRole: s.dayRole,
        nightRole: s.nightRole,
        escalateAfterMinutes: s.escalateAfterMinutes,
        maxHoldMinutes: s.maxHoldMinutes,
      },
    ]),
  );
  const maxInterval = new Map(siteRows.map((s) => [s.id, s.maxCalibrationIntervalDays]));
  const tankRows = await db.select().from(tanks);
  const probeRows = await db.select().from(probes).where(ne(probes.status, "retired"));
  const ruleRows = await db.select().from(alertRules);
  // Completed runs, newest first: the calibration record of every probe.
  const runRows = await db
    .select({ probeId: calibrationRuns.probeId, status: calibrationRuns.status, effectiveAt: calibrationRuns.effectiveAt, reasons: calibrationRuns.reasons })
    .from(calibrationRuns)
    .where(inArray(calibrationRuns.status, ["accepted", "rejected"]))
    .orderBy(desc(sql`coalesce(${calibrationRuns.completedAt}, ${calibrationRuns.startedAt})`), desc(calibrationRuns.id));

  const runsByProbe = new Map<number, typeof runRows>();
  for (const r of runRows) {
    const list = runsByProbe.get(r.probeId) ?? [];
    list.push(r);
    runsByProbe.set(r.probeId, list);
  }

  const probeMap = new Map<number, ProbeContext>();
  for (const p of probeRows) {
    const runs = runsByProbe.get(p.id) ?? [];
    let consecutive = 0;
    while (consecutive < runs.length && runs[consecutive].status === "rejected") consecutive++;
    const accepted = runs.filter((r) => r.status === "accepted" && r.effectiveAt !== null).map((r) => r.effectiveAt as number);
    probeMap.set(p.id, {
      id: p.id,
      kind: p.kind,
      serial: p.serial,
      tankId: p.tankId,
      lastAcceptedAt: accepted.length ? Math.max(...accepted) : null,
      lastRunRejected: runs[0]?.status === "rejected",
      consecutiveRejections: consecutive,
      lastRejectionReasons: runs[0]?.status === "rejected" ? runs[0].reasons : [],
    });
  }

  const tankMap = new Map<number, TankContext>();
  for (const t of tankRows) {
    const site = siteById.get(t.siteId);
    if (!site) continue;
    tankMap.set(t.id, {
      id: t.id,
      orgId: site.orgId,
      name: t.name,
      controllerId: t.controllerId,
      site,
      band: { ph: { min: t.phMin, max: t.phMax }, ec: { min: t.ecMinUs / 1000, max: t.ecMaxUs / 1000 }, temp: { min: t.tempMin, max: t.tempMax } },
      intervalDays: Math.min(t.calibrationIntervalDays, maxInterval.get(t.siteId) ?? t.calibrationIntervalDays),
      probes: probeRows.filter((p) => p.tankId === t.id).map((p) => probeMap.get(p.id)!),
      ...tankRules(
        ruleRows.filter((r) => r.orgId === site.orgId),
        t.id,
      ),
    });
  }
  return { tanks: tankMap, probes: probeMap, loadedAt: now };
}

/** Calibration info of a probe at `now` for lib/alerts. Temperature probes need none. */
export function calibrationInfo(tank: TankContext, probe: ProbeContext, now: number, settings: RuleSettings = tank.settings): ProbeCalibrationInfo {
  if (probe.kind === "temp") return { status: "current", lastAcceptedAt: null, lastRunRejected: false, consecutiveRejections: 0 };
  const dueAt = probe.lastAcceptedAt === null ? null : probe.lastAcceptedAt + tank.intervalDays * DAY_MS;
  return {
    status: calibrationStatusAt({ now, lastAcceptedAt: probe.lastAcceptedAt, dueAt }, settings),
    lastAcceptedAt: probe.lastAcceptedAt,
    dueAt,
    lastRunRejected: probe.lastRunRejected,
    consecutiveRejections: probe.consecutiveRejections,
    lastRejectionReasons: probe.lastRejectionReasons,
  };
}

export interface HoldRow {
  id: number;
  tankId: number;
  probeId: number | null;
  reason: string;
  placedAt: number;
  plannedEndAt: number;
  releasedAt: number | null;
  dosingInhibitSentAt: number | null;
  dosingResumeSentAt: number | null;
}

export interface TankHolds {
  /** The active hold on the whole tank, if any. */
  tank: HoldRow | null;
  /** Active holds on single probes. */
  probes: HoldRow[];
  /** When the last hold (of the tank or any of its probes) ended. */
  lastReleasedAt: number | null;
  /** When the last whole-tank hold ended (starts every probe's settling period). */
  tankReleasedAt: number | null;
  /** When the last hold on each single probe ended (starts that probe's settling period). */
  probeReleasedAt: Map<number, number>;
  /** The last released hold, whose dosing resume may still be outstanding. */
  lastReleased: HoldRow | null;
}

const HOLD_COLUMNS = {
  id: holds.id,
  tankId: holds.tankId,
  probeId: holds.probeId,
  reason: holds.reason,
  placedAt: holds.placedAt,
  plannedEndAt: holds.plannedEndAt,
  releasedAt: holds.releasedAt,
  dosingInhibitSentAt: holds.dosingInhibitSentAt,
  dosingResumeSentAt: holds.dosingResumeSentAt,
};

/** Active holds and the latest release per tank. Cheap enough to read for every batch. */
export async function loadHolds(db: Db): Promise<Map<number, TankHolds>> {
  const active = await db.select(HOLD_COLUMNS).from(holds).where(isNull(holds.releasedAt));
  const latest = await db.all<{ id: number }>(sql`
    SELECT h.id FROM holds h WHERE h.released_at = (SELECT max(released_at) FROM holds WHERE tank_id = h.tank_id)`);
  const released = latest.length
    ? await db.select(HOLD_COLUMNS).from(holds).where(and(inArray(holds.id, latest.map((r) => r.id))))
    : [];
  const releases = await db.all<{ tank_id: number; probe_id: number | null; at: number }>(sql`
    SELECT tank_id, probe_id, max(released_at) AS at FROM holds WHERE released_at IS NOT NULL GROUP BY tank_id, probe_id`);
  const out = new Map<number, TankHolds>();
  const entry = (tankId: number) => {
    let e = out.get(tankId);
    if (!e) out.set(tankId, (e = { tank: null, probes: [], lastReleasedAt: null, lastReleased: null, tankReleasedAt: null, probeReleasedAt: new Map() }));
    return e;
  };
  for (const r of releases) {
    const e = entry(r.tank_id);
    if (r.probe_id === null) e.tankReleasedAt = r.at;
    else e.probeReleasedAt.set(r.probe_id, r.at);
  }
  for (const h of active) {
    const e = entry(h.tankId);
    if (h.probeId === null) e.tank = h;
    else e.probes.push(h);
  }
  for (const h of released) {
    const e = entry(h.tankId);
    if (e.lastReleased === null || (h.releasedAt ?? 0) > (e.lastReleased.releasedAt ?? 0)) {
      e.lastReleased = h;
      e.lastReleasedAt = h.releasedAt;
    }
  }
  return out;
}

/** When a probe's settling period starts: the end of the last hold on its tank or on it alone. */
export function settlingFrom(h: TankHolds | undefined, probeId: number): number | null {
  if (!h) return null;
  const own = h.probeReleasedAt.get(probeId) ?? null;
  if (h.tankReleasedAt === null) return own;
  return own === null ? h.tankReleasedAt : Math.max(own, h.tankReleasedAt);
}

/** The hold the time rules see: the tank's own, else the probe hold due to end first (covering all held probes). */
export function timeRuleHold(h: TankHolds | undefined): { hold: HoldRow; probeIds: string[] | null } | null {
  if (!h) return null;
  if (h.tank) return { hold: h.tank, probeIds: null };
  if (h.probes.length === 0) return null;
  const first = h.probes.reduce((a, b) => (b.plannedEndAt < a.plannedEndAt ? b : a));
  return { hold: first, probeIds: h.probes.map((p) => String(p.probeId)) };
}

/** Last reading time per probe (any quality), for the stale rule after a restart. */
export async function lastReadingTimes(db: Db, probeIds: number[]): Promise<Map<number, number>> {
  if (probeIds.length === 0) return new Map();
  const rows = await db.all<{ probe_id: number; ts: number | null }>(sql`
    SELECT p.id AS probe_id, (SELECT max(ts) FROM readings r WHERE r.probe_id = p.id) AS ts
    FROM probes p WHERE p.id IN (${sql.join(probeIds, sql`, `)})`);
  return new Map(rows.filter((r) => r.ts !== null).map((r) => [r.probe_id, r.ts as number]));
}
