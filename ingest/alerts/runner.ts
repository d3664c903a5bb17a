// The alert runner: evaluates lib/alerts for every committed reading batch and every 30 s
// tick, turns the alerts into incidents (state persisted in the same transaction, so a
// restart never fires twice), mails whoever is on shift, escalates, expires holds, keeps
// the controllers' dosing commands in step with the holds, and sends the morning digest.
//
// A batch that raises no event changes only the rules' running state (windows, counts, last
// values). That is saved at most once a second, with the next batch or tick after it, instead of
// with every batch: the ingest commits up to twenty batches a second, and each save was a write
// transaction competing with the ingest's own for SQLite's one write lock. A crash loses at most
// that second of running state, never a firing or a clearing: every event is saved with the
// state that raised it.
import { and, eq, isNotNull, isNull, lte, ne } from "drizzle-orm";
import type { Db } from "../../db/client";
import { incidentEvents, incidents, sites } from "../../db/schema";
import { releaseHold, markDosingSent } from "../../db/queries/holds";
import { evaluateReading, evaluateTime, isFiring, restoreProbeState, restoreTankState, formatDuration, type AlertEvent, type Cause, type ReadingTankContext } from "../../lib/alerts";
import type { PackedReadings } from "../packed-readings";
import { sendMail as smtpSendMail } from "../mailer";
import { calibrationInfo, lastReadingTimes, loadContext, loadHolds, settlingFrom, timeRuleHold, type AlertContext, type HoldRow, type ProbeContext, type TankContext, type TankHolds } from "./context";
import { sendDueDigests } from "./digest";
import { DOSING_PUBLISH, inhibitMessage, resumeMessage } from "./dosing-command";
import { applyAlertEvents, type Applied, type IncidentChange } from "./incident-store";
import { mailIncident, recipientsWithRole, routeFor, type SendMail } from "./notify";
import { EVENT_PUBLISH, orgEventMessage } from "./org-events";
import type { Publish } from "./publish";
import { probeKey, readStates, tankKey, writeStates } from "./state-store";

export interface AlertRunnerOptions {
  db: Db;
  publish: Publish;
  /** Defaults to SMTP via ingest/mailer. */
  sendMail?: SendMail;
  /** Wall clock for batches (notification times, shift routing); ticks bring their own `now`. */
  clock?: () => number;
  /** An incident whose condition stayed clear this long is resolved automatically. */
  resolveAfterMs?: number;
  log?: (message: string, err?: unknown) => void;
}

export interface AlertRunner {
  onReadings(readings: PackedReadings): Promise<void>;
  tick(now?: number): Promise<void>;
}

export const AUTO_RESOLVE_AFTER_MS = 5 * 60_000;
/** How long tank, rule and calibration data are reused between batches (every tick reloads them). */
const CONTEXT_TTL_MS = 10_000;
/** How long running state that raised no event may wait to be saved. */
const SAVE_STATE_EVERY_MS = 1_000;
const PUBLISH_WAIT_MS = 5_000;

/** Causes that page nobody and never escalate: the morning digest lists them. */
const DIGEST_ONLY: readonly Cause[] = ["calibration-due-soon"];

export function createAlertRunner(o: AlertRunnerOptions): AlertRunner {
  const { db } = o;
  // A client that is offline may hold a QoS 1 publish until it reconnects: never wait on it.
  const publish: Publish = (topic, payload, opts) =>
    new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error("the broker did not confirm within 5 s")), PUBLISH_WAIT_MS);
      o.publish(topic, payload, opts).then(
        (v) => (clearTimeout(timer), resolve(v)),
        (err: unknown) => (clearTimeout(timer), reject(err)),
      );
    });
  const sendMail = o.sendMail ?? smtpSendMail;
  const clock = o.clock ?? Date.now;
  // When this runner first looked. Before then nobody was watching (the worker was down or just
  // deployed), so a probe gets one stale period from here to report before it counts as stale.
  let watchingSince: number | null = null;
  const resolveAfterMs = o.resolveAfterMs ?? AUTO_RESOLVE_AFTER_MS;
  const log = o.log ?? ((m: string, err?: unknown) => console.error(`[alerts] ${m}`, err ?? ""));

  let ctx: AlertContext | null = null;
  let ctxAt = 0;
  const states = new Map<string, unknown>();
  /** Keys whose state in `states` is newer than the database's. */
  const unsaved = new Set<string>();
  let savedAt = Number.NEGATIVE_INFINITY;
  let chain: Promise<unknown> = Promise.resolve();

  // Batches and ticks touch the same per-probe state: run them one at a time.
  function serial<T>(fn: () => Promise<T>): Promise<T> {
    const run = chain.then(fn);
    chain = run.catch(() => undefined);
    return run;
  }

  async function context(fresh: boolean): Promise<AlertContext> {
    const wall = clock();
    if (fresh || !ctx || wall - ctxAt > CONTEXT_TTL_MS) {
      ctx = await loadContext(db, wall);
      ctxAt = wall;
    }
    return ctx;
  }

  async function ensureStates(keys: string[]) {
    const missing = keys.filter((k) => !states.has(k));
    if (missing.length === 0) return;
    const stored = await readStates(db, missing);
    for (const k of missing) states.set(k, stored.get(k) ?? null);
  }

  function firingOnTank(c: AlertContext, tank: TankContext, cause: Cause, working: Map<string, unknown>): boolean {
    const get = (k: string) => (working.has(k) ? working.get(k) : states.get(k));
    if (tank.probes.some((p) => isFiring(restoreProbeState(get(probeKey(p.id))), cause))) return true;
    return isFiring(restoreTankState(get(tankKey(tank.id))), cause);
  }

  async function announce(changes: { type: IncidentChange["type"] | "hold.released"; orgId: number; tankId: number; id: number; at: number; summary: string }[]) {
    for (const ch of changes) {
      const msg = orgEventMessage({ type: ch.type, orgId: ch.orgId, tankId: ch.tankId, id: ch.id, at: ch.at, summary: ch.summary });
      try {
        await publish(msg.topic, msg.payload, EVENT_PUBLISH);
      } catch (err) {
        log(`could not publish ${ch.type}`, err);
      }
    }
  }

  /**
   * Persists states and incident changes in one transaction, then announces and mails. A batch's
   * states may wait when it raised no event (see the top of this file); a tick saves everything.
   */
  async function commit(c: AlertContext, working: Map<string, unknown>, eventsByTank: Map<number, AlertEvent[]>, at: number, mayWait = false) {
    if (mayWait && eventsByTank.size === 0 && clock() - savedAt < SAVE_STATE_EVERY_MS) {
      for (const [k, v] of working) {
        states.set(k, v);
        unsaved.add(k);
      }
      return;
    }
    const applied: Applied = { opened: [], changes: [] };
    const toSave = new Map<string, unknown>();
    for (const k of unsaved) toSave.set(k, states.get(k));
    for (const [k, v] of working) toSave.set(k, v);
    await db.transaction(async (tx) => {
      await writeStates(tx, [...toSave], at);
      for (const [tankId, events] of eventsByTank) {
        const tank = c.tanks.get(tankId);
        if (tank) await applyAlertEvents(tx, tank, events, (cause) => firingOnTank(c, tank, cause, working), applied);
      }
    });
    savedAt = clock();
    unsaved.clear();
    for (const [k, v] of working) states.set(k, v);
    await announce(applied.changes.map((ch) => ({ ...ch, id: ch.incidentId })));
    const mailAt = clock();
    for (const { incidentId, tank, event } of applied.opened) {
      if (DIGEST_ONLY.includes(event.cause)) {
        await db.insert(incidentEvents).values({ incidentId, at: mailAt, kind: "notified", detail: "Not paged: calibrations due soon are listed in the morning digest" });
        continue;
      }
      try {
        const route = routeFor(tank, event, mailAt);
        const recipients = await recipientsWithRole(db, tank.orgId, route.role);
        await mailIncident(
          db,
          sendMail,
          { incidentId, tank, cause: event.cause, message: event.message, severity: event.severity, openedAt: event.at, calibrationLapsed: event.calibrationLapsed },
          { kind: "incident", recipients, route, now: mailAt },
        );
      } catch (err) {
        log(`could not notify incident ${incidentId}`, err);
      }
    }
  }

  function isHeld(h: TankHolds | undefined, probeId: number): boolean {
    return !!h && (h.tank !== null || h.probes.some((p) => p.probeId === probeId));
  }

  /** What the reading rules need of a probe that does not change within one batch. */
  interface ProbeInBatch {
    key: string;
    probe: ProbeContext;
    tank: TankContext;
    probeId: string;
    tankInput: ReadingTankContext;
  }

  async function handleReadings(readings: PackedReadings) {
    if (readings.length === 0) return;
    const probeIds = new Set<number>();
    for (let i = 0; i < readings.length; i++) probeIds.add(readings.probeId(i));
    let c = await context(false);
    if ([...probeIds].some((id) => !c.probes.has(id))) c = await context(true); // a probe added since loading
    const holdsByTank = await loadHolds(db);
    // Worked out once per probe per batch, not for each of its readings.
    const inBatch = new Map<number, ProbeInBatch | null>();
    for (const probeId of probeIds) {
      const probe = c.probes.get(probeId);
      const tank = probe ? c.tanks.get(probe.tankId) : undefined;
      if (!probe || !tank) {
        inBatch.set(probeId, null);
        continue;
      }
      const h = holdsByTank.get(tank.id);
      inBatch.set(probeId, {
        key: probeKey(probe.id),
        probe,
        tank,
        probeId: String(probe.id),
        tankInput: { band: tank.band, hold: { active: isHeld(h, probe.id), releasedAt: settlingFrom(h, probe.id) } },
      });
    }
    const known = [...inBatch.values()].filter((p): p is ProbeInBatch => p !== null);
    await ensureStates(known.map((p) => p.key));
    const working = new Map<string, unknown>();
    const eventsByTank = new Map<number, AlertEvent[]>();
    // In time order, by index: the batch stays packed (see ../packed-readings.ts).
    const order = Array.from({ length: readings.length }, (_, i) => i).sort((a, b) => readings.ts(a) - readings.ts(b));
    for (const i of order) {
      const p = inBatch.get(readings.probeId(i));
      if (!p) continue;
      const ts = readings.ts(i);
      const kind = readings.kind(i);
      const value = readings.value(i);
      const result = evaluateReading({
        state: (working.has(p.key) ? working.get(p.key) : states.get(p.key)) as never,
        probeId: p.probeId,
        // lib/alerts works in mS/cm; readings carry µS/cm.
        reading: { ts, value: value === null ? null : kind === "ec" ? value / 1000 : value, raw: readings.raw(i), measure: kind, quality: readings.quality(i) },
        tank: p.tankInput,
        calibration: { status: calibrationInfo(p.tank, p.probe, ts).status },
        settings: p.tank.settings,
      });
      working.set(p.key, result.state);
      if (result.events.length) eventsByTank.set(p.tank.id, [...(eventsByTank.get(p.tank.id) ?? []), ...result.events]);
    }
    await commit(c, working, eventsByTank, clock(), true);
  }

  async function expireHolds(c: AlertContext, now: number): Promise<boolean> {
    const byTank = await loadHolds(db);
    let expired = false;
    for (const [tankId, h] of byTank) {
      const tank = c.tanks.get(tankId);
      if (!tank) continue;
      for (const hold of [h.tank, ...h.probes].filter((x): x is HoldRow => x !== null)) {
        if (hold.placedAt + tank.site.maxHoldMinutes * 60_000 > now) continue;
        try {
          await releaseHold(db, { orgId: tank.orgId, user: null }, hold.id, now);
          expired = true;
          await announce([{ type: "hold.released", orgId: tank.orgId, tankId, id: hold.id, at: now, summary: `${tank.name}: hold expired after ${tank.site.maxHoldMinutes} min` }]);
        } catch (err) {
          log(`could not expire hold ${hold.id}`, err);
        }
      }
    }
    return expired;
  }

  /** Sends any inhibit or resume the web could not deliver (retained, so resending is harmless). */
  async function syncDosing(c: AlertContext, byTank: Map<number, TankHolds>, now: number): Promise<boolean> {
    let changed = false;
    for (const [tankId, h] of byTank) {
      const tank = c.tanks.get(tankId);
      if (!tank?.controllerId) continue;
      const active = h.tank ?? h.probes[0] ?? null;
      const pending = active
        ? active.dosingInhibitSentAt === null
          ? { hold: active, command: "inhibit" as const, msg: inhibitMessage(tank.controllerId, active, now) }
          : null
        : h.lastReleased && h.lastReleased.dosingInhibitSentAt !== null && h.lastReleased.dosingResumeSentAt === null
          ? { hold: h.lastReleased, command: "resume" as const, msg: resumeMessage(tank.controllerId, h.lastReleased, now) }
          : null;
      if (!pending) continue;
      try {
        await publish(pending.msg.topic, pending.msg.payload, DOSING_PUBLISH);
        await markDosingSent(db, pending.hold.id, pending.command, now);
        changed = true;
      } catch (err) {
        log(`could not send dosing ${pending.command} to ${tank.controllerId}`, err);
      }
    }
    return changed;
  }

  async function evaluateTimeRules(c: AlertContext, byTank: Map<number, TankHolds>, now: number) {
    watchingSince ??= now;
    const since = watchingSince;
    const probeIds = [...c.probes.keys()];
    const lastAt = await lastReadingTimes(db, probeIds);
    await ensureStates([...probeIds.map(probeKey), ...[...c.tanks.keys()].map(tankKey)]);
    const working = new Map<string, unknown>();
    const eventsByTank = new Map<number, AlertEvent[]>();
    for (const tank of c.tanks.values()) {
      const h = byTank.get(tank.id);
      const onHold = timeRuleHold(h);
      const active = onHold?.hold ?? null;
      const released = h?.lastReleased ?? null;
      const result = evaluateTime({
        now,
        probes: tank.probes.map((p) => ({
          probeId: String(p.id),
          measure: p.kind,
          state: states.get(probeKey(p.id)) as never,
          lastReadingAt: lastSeenForStale(lastAt.get(p.id), states.get(probeKey(p.id)), since),
          calibration: calibrationInfo(tank, p, now),
        })),
        tank: {
          hold: active ? { active: true, probeIds: onHold?.probeIds ?? null, placedAt: active.placedAt, plannedEndAt: active.plannedEndAt, releasedAt: h?.lastReleasedAt ?? null } : { active: false, releasedAt: h?.lastReleasedAt ?? null },
          dosingInhibit: active
            ? { active: active.dosingInhibitSentAt !== null, plannedEndAt: active.plannedEndAt }
            : { active: !!released && released.dosingInhibitSentAt !== null && released.dosingResumeSentAt === null, plannedEndAt: released?.plannedEndAt ?? null },
        },
        tankState: states.get(tankKey(tank.id)) as never,
        settings: tank.settings,
      });
      for (const p of result.probes) working.set(probeKey(Number(p.probeId)), p.state);
      working.set(tankKey(tank.id), result.tankState);
      if (result.events.length) eventsByTank.set(tank.id, result.events);
    }
    await commit(c, working, eventsByTank, now);
  }

  async function autoResolve(c: AlertContext, now: number) {
    const due = await db
      .select()
      .from(incidents)
      .where(and(ne(incidents.state, "resolved"), isNotNull(incidents.clearedAt), lte(incidents.clearedAt, now - resolveAfterMs)));
    for (const i of due) {
      const done = await db.transaction(async (tx) => {
        const [row] = await tx
          .update(incidents)
          .set({ state: "resolved", resolvedAt: now, resolvedBy: null })
          .where(and(eq(incidents.id, i.id), ne(incidents.state, "resolved"), isNotNull(incidents.clearedAt)))
          .returning({ id: incidents.id });
        if (!row) return false;
        await tx.insert(incidentEvents).values({ incidentId: i.id, at: now, kind: "resolved", detail: `Resolved automatically: the condition stayed clear for ${formatDuration(now - (i.clearedAt ?? now))}` });
        return true;
      });
      const tank = c.tanks.get(i.tankId);
      if (done) await announce([{ type: "incident.resolved", orgId: i.orgId, tankId: i.tankId, id: i.id, at: now, summary: `${tank?.name ?? "Tank"}: resolved automatically — ${i.message}` }]);
    }
  }

  async function escalate(c: AlertContext, now: number) {
    const open = await db
      .select({ incident: incidents, after: sites.escalateAfterMinutes })
      .from(incidents)
      .innerJoin(sites, eq(sites.id, incidents.siteId))
      .where(and(eq(incidents.state, "open"), isNull(incidents.escalatedAt), isNull(incidents.clearedAt)));
    for (const { incident: i, after } of open) {
      if (i.openedAt + after * 60_000 > now || DIGEST_ONLY.includes(i.cause as Cause)) continue;
      const tank = c.tanks.get(i.tankId);
      if (!tank) continue;
      const claimed = await db.transaction(async (tx) => {
        const [row] = await tx.update(incidents).set({ escalatedAt: now }).where(and(eq(incidents.id, i.id), isNull(incidents.escalatedAt))).returning({ id: incidents.id });
        if (!row) return false;
        await tx.insert(incidentEvents).values({ incidentId: i.id, at: now, kind: "escalated", detail: `Unacknowledged for ${after} min; escalated to the owner` });
        return true;
      });
      if (!claimed) continue;
      await announce([{ type: "incident.updated", orgId: i.orgId, tankId: i.tankId, id: i.id, at: now, summary: `${tank.name}: escalated to the owner — ${i.message}` }]);
      try {
        const owners = await recipientsWithRole(db, i.orgId, "owner");
        await mailIncident(
          db,
          sendMail,
          { incidentId: i.id, tank, cause: i.cause as Cause, message: i.message, severity: i.severity, openedAt: i.openedAt, calibrationLapsed: i.calibrationLapsed },
          { kind: "escalation", recipients: owners, route: { role: "owner", why: `and nobody acknowledged the incident within ${after} min`, duty: `to take an escalation at ${tank.site.name}` }, now },
        );
      } catch (err) {
        log(`could not escalate incident ${i.id}`, err);
      }
    }
  }

  async function handleTick(now: number) {
    const c = await context(true);
    await expireHolds(c, now);
    let byTank = await loadHolds(db);
    if (await syncDosing(c, byTank, now)) byTank = await loadHolds(db);
    await evaluateTimeRules(c, byTank, now);
    await autoResolve(c, now);
    await escalate(c, now);
    try {
      await sendDueDigests(db, sendMail, c, now);
    } catch (err) {
      log("could not send the morning digest", err);
    }
  }

  return {
    onReadings: (readings) => serial(() => handleReadings(readings)),
    tick: (now) => serial(() => handleTick(now ?? clock())),
  };
}

/** A probe already stale stays judged by its real last reading; others start from `since`. */
function lastSeenForStale(lastReadingAt: number | undefined, state: unknown, since: number): number | null {
  if (lastReadingAt === undefined) return null;
  if (isFiring(restoreProbeState(state), "stale")) return lastReadingAt;
  return Math.max(lastReadingAt, since);
}
