// Guided calibration runs: start (placing the tank on hold), capture points from the live
// reading, confirm steps, and save the verdict. The run's state lives in calibration_runs
// (status "in_progress") and calibration_points, so a closed browser resumes at the right step.
import { and, asc, desc, eq, inArray, isNull, ne } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationPoints, calibrationRuns, holds, probes } from "../schema";
import {
  BUFFER_IDS,
  CalibrationInputError,
  EC_STANDARD_IDS,
  bufferPh,
  bufferTableProblem,
  ecFromConductance,
  ecStandardAt,
  fitEc,
  fitPh,
  parseStandardText,
  phFromMv,
  runProgress,
  type BufferSpec,
  type EcStandardSpec,
  type RunProgress,
} from "../../lib/calibration";
import { conflict, unprocessable } from "../../app/_server/errors";
import { audit, type Tx } from "./audit";
import { DEFAULT_HOLD_MINUTES, placeHold } from "./holds";
import { calibrationInForce, probeInOrg, runInOrg, utcDay, type ProbeRow, type RunRow } from "./calibration-scope";
import { latestTemperature, liveSnapshot } from "./calibration-live";
import { recomputeFrom, type RecomputeResult } from "../../ingest/recompute";

export interface Actor {
  id: number;
  orgId: number;
}

/** Neutral first, then acid (common practice in hydroponics); one conductivity standard for EC. */
export const DEFAULT_STANDARDS = { ph: ["tech-7.00", "tech-4.01"], ec: ["kcl-0.01M"] } as const;
export const CALIBRATION_HOLD_REASON = "Calibration run";

export type PointRow = typeof calibrationPoints.$inferSelect;

/** Turns a library refusal (impossible input) into a 422 the grower can act on. */
export function asUnprocessable<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof CalibrationInputError) throw unprocessable(err.message);
    throw err;
  }
}

function checkStandards(kind: ProbeRow["kind"], standards: readonly string[]) {
  if (kind === "temp") throw unprocessable("Temperature probes are not calibrated in Tidewell; check them against a reference thermometer.");
  const max = kind === "ph" ? 3 : 1;
  if (standards.length < 1 || standards.length > max) {
    throw unprocessable(kind === "ph" ? "A pH run takes 1 to 3 buffers." : "An EC run takes one conductivity standard.");
  }
  standards.forEach((s, i) => {
    const spec = parseStandardText(s);
    const known = kind === "ph" ? (BUFFER_IDS as readonly string[]) : (EC_STANDARD_IDS as readonly string[]);
    if (typeof spec === "string" && !known.includes(spec)) throw unprocessable(`"${s}" is not a ${kind === "ph" ? "pH buffer" : "conductivity standard"} Tidewell knows.`);
    if (typeof spec === "object") {
      const tableProblem = kind === "ph" ? bufferTableProblem(spec) : null;
      if (tableProblem) throw unprocessable(tableProblem, { [`standards.${i}`]: tableProblem });
      asUnprocessable(() => (kind === "ph" ? bufferPh(spec as BufferSpec, (spec as { points: [number, number][] }).points?.[0]?.[0] ?? 25) : ecStandardAt(spec as EcStandardSpec, 25)));
    }
  });
  if (new Set(standards).size !== standards.length) throw unprocessable("Each buffer can be used once in a run; choose different buffers, for example pH 7 then pH 4.");
}

export interface StartRunInput {
  tankId: number;
  probeId: number;
  standards?: string[];
  holdMinutes?: number;
}

export interface StartedRun {
  runId: number;
  resumed: boolean;
  /** The hold this run placed, and its tank, for the dosing-inhibit command sent after commit. */
  placed: Awaited<ReturnType<typeof placeHold>> | null;
}

/**
 * Starts a guided run on a probe; a run already in progress on the probe is resumed instead.
 * The tank is put on hold (reason "Calibration run", the planned length) unless it already is.
 */
export async function startRun(db: Db, user: Actor, input: StartRunInput, now = Date.now()): Promise<StartedRun> {
  const { probe, tank } = await probeInOrg(db, user.orgId, input.probeId);
  if (probe.tankId !== input.tankId) throw unprocessable("That probe is not in that tank.");
  if (probe.status === "retired") throw unprocessable("That probe is retired; calibrate the probe that replaced it.");
  const standards = input.standards ?? [...(probe.kind === "ec" ? DEFAULT_STANDARDS.ec : DEFAULT_STANDARDS.ph)];
  checkStandards(probe.kind, standards);

  const [open] = await db
    .select()
    .from(calibrationRuns)
    .where(and(eq(calibrationRuns.probeId, probe.id), eq(calibrationRuns.status, "in_progress")))
    .limit(1);
  if (open) return { runId: open.id, resumed: true, placed: null };

  const active = await db.select().from(holds).where(and(eq(holds.tankId, tank.id), isNull(holds.releasedAt))).orderBy(desc(holds.placedAt));
  let hold = active.find((h) => h.probeId === null || h.probeId === probe.id);
  let placed: StartedRun["placed"] = null;
  if (!hold) {
    // Another probe of the tank is held on its own: hold this probe too rather than the whole tank.
    placed = await placeHold(db, user, { tankId: tank.id, probeId: active.length ? probe.id : null, reason: CALIBRATION_HOLD_REASON, minutes: input.holdMinutes ?? DEFAULT_HOLD_MINUTES }, now);
    hold = placed.hold;
  }
  const holdId = hold.id;
  const runId = await db.transaction(async (tx) => {
    const [run] = await tx
      .insert(calibrationRuns)
      .values({ probeId: probe.id, tankId: tank.id, source: "guided", status: "in_progress", startedBy: user.id, startedAt: now, holdId, plannedStandards: standards })
      .returning();
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "calibration.start", entity: "calibration_run", entityId: run.id, detail: { probe: probe.serial, standards }, at: now });
    return run.id;
  });
  return { runId, resumed: false, placed };
}

async function runPoints(db: Db | Tx, runId: number): Promise<PointRow[]> {
  return db.select().from(calibrationPoints).where(eq(calibrationPoints.runId, runId)).orderBy(asc(calibrationPoints.seq));
}

function progressOf(run: RunRow, points: PointRow[], hasPrevious: boolean): RunProgress {
  return runProgress({
    plannedStandards: run.plannedStandards,
    hasPreviousCalibration: hasPrevious,
    asFoundTaken: points.some((p) => p.purpose === "as_found"),
    asFoundSkipped: run.asFoundSkipped,
    cleaned: run.cleanedAt !== null,
    pointsTaken: points.filter((p) => p.purpose === "point").length,
  });
}

export type Fit =
  | { kind: "ph"; slopePct: number; offsetMv: number; verdict: "accepted" | "rejected"; reasons: string[]; advice: string[]; residuals?: number[] }
  | { kind: "ec"; cellConstant: number; deviationPct: number; nominalCellConstant: number; verdict: "accepted" | "rejected"; reasons: string[]; advice: string[] };

/** Fits the run's captured points (as-found checks are not part of the fit). */
export function fitPoints(probe: ProbeRow, points: PointRow[], previous: RunRow | null): Fit {
  const used = points.filter((p) => p.purpose === "point");
  return asUnprocessable((): Fit => {
    if (probe.kind === "ph") {
      const prev = previous?.slopePct != null && previous.offsetMv != null ? { slopePct: previous.slopePct, offsetMv: previous.offsetMv } : undefined;
      const fit = fitPh(
        used.map((p) => ({ buffer: parseStandardText(p.standard) as BufferSpec, mv: p.mv ?? NaN, tempC: p.tempC })),
        { previous: prev },
      );
      return { kind: "ph", slopePct: fit.slopePct, offsetMv: fit.offsetMv, verdict: fit.verdict, reasons: fit.reasons, advice: fit.advice ?? [], residuals: fit.residuals };
    }
    const [p] = used;
    if (!p) throw new CalibrationInputError("point-count", "An EC calibration needs its standard's point");
    const nominal = probe.nominalCellConstant ?? 1;
    const fit = fitEc({ standard: parseStandardText(p.standard) as EcStandardSpec, conductanceUs: p.conductanceUs ?? NaN, tempC: p.tempC, nominalCellConstant: nominal });
    const advice = fit.verdict === "rejected" ? ["Clean the probe and retry once in fresh standard; a probe rejected twice in a row is due for replacement"] : [];
    return { kind: "ec", cellConstant: fit.cellConstant, deviationPct: fit.deviationPct, nominalCellConstant: nominal, verdict: fit.verdict, reasons: fit.reasons, advice };
  });
}

export interface RunView {
  run: RunRow;
  probe: ProbeRow;
  tank: { id: number; name: string; controllerId: string | null; onHold: boolean; holdId: number | null };
  points: PointRow[];
  progress: RunProgress;
  previous: RunRow | null;
  /** The fit of the captured points once every point is in (before saving), or why it cannot be made. */
  preview: Fit | { error: string } | null;
  /** The previous finished run of this probe was rejected: a second rejection marks it for replacement. */
  previousRejected: boolean;
}

export async function getRunView(db: Db, orgId: number, runId: number): Promise<RunView> {
  const { run, probe, tank } = await runInOrg(db, orgId, runId);
  const points = await runPoints(db, run.id);
  const previous = await calibrationInForce(db, probe.id, run.startedAt);
  const progress = progressOf(run, points, previous !== null);
  let preview: RunView["preview"] = null;
  const allTaken = progress.steps[progress.current]?.key === "result";
  if (run.status !== "in_progress") preview = null;
  else if (allTaken) {
    try {
      preview = fitPoints(probe, points, previous);
    } catch (err) {
      preview = { error: err instanceof Error ? err.message : "The points could not be fitted." };
    }
  }
  const [activeHold] = await db.select({ id: holds.id }).from(holds).where(and(eq(holds.tankId, tank.id), isNull(holds.releasedAt))).limit(1);
  return {
    run,
    probe,
    tank: { id: tank.id, name: tank.name, controllerId: tank.controllerId, onHold: Boolean(activeHold), holdId: activeHold?.id ?? null },
    points,
    progress,
    previous,
    preview,
    previousRejected: (await lastFinishedRun(db, probe.id, run.id))?.status === "rejected",
  };
}

async function lastFinishedRun(db: Db | Tx, probeId: number, exceptRunId: number): Promise<RunRow | null> {
  const [row] = await db
    .select()
    .from(calibrationRuns)
    .where(and(eq(calibrationRuns.probeId, probeId), inArray(calibrationRuns.status, ["accepted", "rejected"]), ne(calibrationRuns.id, exceptRunId)))
    .orderBy(desc(calibrationRuns.completedAt), desc(calibrationRuns.id))
    .limit(1);
  return row ?? null;
}

async function inProgress(db: Db, orgId: number, runId: number) {
  const scope = await runInOrg(db, orgId, runId);
  if (scope.run.status !== "in_progress") throw conflict(`This calibration run is already ${scope.run.status}; start a new run to calibrate again.`);
  if (scope.run.source !== "guided") throw conflict("Only guided runs take points.");
  return scope;
}

export interface CaptureInput {
  purpose: "as_found" | "point";
  lot?: string;
  expiresOn?: string;
  /** Typed temperature; without it the tank's temperature probe is used. */
  tempC?: number;
  /** Required to capture a reading that is not yet stable. */
  note?: string;
  /**
   * The time of the reading the grower saw and chose to capture. Its stability is judged over the
   * window ending there, so a sample arriving between their click and the request cannot turn
   * a stable reading into a refusal.
   */
  readingTs?: number;
}

/** Refuses an expired buffer or standard, with the reason. */
export function checkExpiry(expiresOn: string | undefined, at: number) {
  if (expiresOn && expiresOn < utcDay(at)) {
    throw unprocessable(`This bottle expired on ${expiresOn}; an expired buffer or standard gives a wrong calibration. Use a bottle within its date.`, {
      expiresOn: `Expired on ${expiresOn}`,
    });
  }
}

/**
 * Captures the current step's point from the probe's live raw reading (mV or µS), at the
 * tank's temperature or a typed one. A reading that has not settled is captured only with a note.
 */
export async function capturePoint(db: Db, user: Actor, runId: number, input: CaptureInput, now = Date.now()) {
  const { run, probe, tank } = await inProgress(db, user.orgId, runId);
  const points = await runPoints(db, run.id);
  const previous = await calibrationInForce(db, probe.id, run.startedAt);
  const progress = progressOf(run, points, previous !== null);
  const step = progress.steps[progress.current];
  const expectedKey = input.purpose === "as_found" ? "as-found" : "point";
  if (step.key !== expectedKey) throw conflict(`This run is at the ${step.key} step, not the ${expectedKey} step; reload the page.`);
  if (input.purpose === "point" && (!input.lot || !input.expiresOn)) {
    throw unprocessable("Record the bottle's lot and expiry date for each calibration point.", {
      ...(input.lot ? {} : { lot: "Enter the lot number from the bottle" }),
      ...(input.expiresOn ? {} : { expiresOn: "Enter the expiry date from the bottle" }),
    });
  }
  checkExpiry(input.expiresOn, now);

  const live = await liveSnapshot(db, probe, { now, since: now - 1, asOf: input.readingTs });
  if (!live.latest || !live.fresh) throw unprocessable("No reading from the probe in the last 15 seconds: check it is connected and in the buffer, then try again.");
  if (!live.stability.stable && !input.note?.trim()) {
    throw unprocessable(
      `The reading has not settled yet (it moved ${live.stability.spread.toFixed(live.stability.unit === "pH" ? 3 : 2)} ${live.stability.unit} over the last ${Math.round(live.stability.coveredMs / 1000)} s); wait for it, or add a note to capture it anyway.`,
      { note: "A note is needed to capture an unsettled reading" },
    );
  }
  let tempC = input.tempC;
  let tempSource: "probe" | "typed" = "typed";
  if (tempC === undefined) {
    const t = await latestTemperature(db, tank.id, now);
    if (!t) throw unprocessable("No recent reading from the tank's temperature probe; type the buffer's temperature in.", { tempC: "Type the temperature" });
    tempC = t.value;
    tempSource = "probe";
  }
  const standard = step.standard!;
  const spec = parseStandardText(standard);
  const expected = asUnprocessable(() => (probe.kind === "ph" ? bufferPh(spec as BufferSpec, tempC) : ecStandardAt(spec as EcStandardSpec, tempC)));
  const raw = live.latest.raw;

  return db.transaction(async (tx) => {
    const [point] = await tx
      .insert(calibrationPoints)
      .values({
        runId: run.id,
        seq: points.length + 1,
        purpose: input.purpose,
        standard,
        lot: input.lot ?? null,
        expiresOn: input.expiresOn ?? null,
        mv: probe.kind === "ph" ? raw : null,
        conductanceUs: probe.kind === "ec" ? raw : null,
        tempC,
        tempSource,
        expected,
        capturedAt: now,
        stable: live.stability.stable,
        note: input.note?.trim() || null,
      })
      .returning();
    if (input.purpose === "as_found" && previous) {
      await tx.update(calibrationRuns).set(asFoundError(probe, tank.ecAlphaPerC, previous, raw, tempC, expected, spec)).where(eq(calibrationRuns.id, run.id));
    }
    return point;
  });
}

/** As-found error of the calibration in force: pH reading − buffer pH, or EC error in %. */
function asFoundError(probe: ProbeRow, alphaPerC: number, previous: RunRow, raw: number, tempC: number, expected: number, spec: BufferSpec | EcStandardSpec) {
  if (probe.kind === "ph") {
    const reading = phFromMv(raw, tempC, { slopePct: previous.slopePct ?? 100, offsetMv: previous.offsetMv ?? 0 });
    return { asFoundErrorPh: reading - expected };
  }
  const ec25 = ecFromConductance(raw, tempC, { cellConstant: previous.cellConstant ?? 1, alphaPerC });
  const standard25 = ecStandardAt(spec as EcStandardSpec, 25);
  return { asFoundErrorPct: ((ec25 - standard25) / standard25) * 100 };
}

/** Confirms the clean-and-rinse step, or skips the as-found check. */
export async function confirmStep(db: Db, user: Actor, runId: number, step: "clean" | "skip-as-found", now = Date.now()) {
  const { run, probe } = await inProgress(db, user.orgId, runId);
  const points = await runPoints(db, run.id);
  const previous = await calibrationInForce(db, probe.id, run.startedAt);
  const current = progressOf(run, points, previous !== null).steps.find((s) => !s.done);
  const wanted = step === "clean" ? "clean" : "as-found";
  if (current?.key !== wanted) throw conflict(`This run is at the ${current?.key ?? "result"} step; reload the page.`);
  await db
    .update(calibrationRuns)
    .set(step === "clean" ? { cleanedAt: now } : { asFoundSkipped: true })
    .where(eq(calibrationRuns.id, run.id));
}

export interface SavedRun {
  run: RunRow;
  fit: Fit;
  probeMarkedForReplacement: boolean;
  /** Readings corrected again when the calibration took effect before now (null otherwise). */
  recomputed: RecomputeResult | null;
}

export interface CompleteRunInput {
  note?: string;
  /**
   * When the calibration was really done, for a run entered late; defaults to now. Not in the
   * future and after the probe's previous accepted calibration; readings since are corrected again.
   */
  effectiveAt?: number;
}

/** Refuses an effective time in the future, before the probe was installed, or not after its previous accepted calibration. */
async function checkEffectiveAt(db: Db, probe: ProbeRow, runId: number, effectiveAt: number, now: number) {
  if (effectiveAt > now) throw unprocessable("The calibration time is in the future.", { effectiveAt: "Not in the future: enter when the run was done" });
  if (effectiveAt < probe.installedAt) throw unprocessable("The calibration time is before the probe was installed.", { effectiveAt: "Before the probe was installed; check the date" });
  const [previous] = await db
    .select({ effectiveAt: calibrationRuns.effectiveAt })
    .from(calibrationRuns)
    .where(and(eq(calibrationRuns.probeId, probe.id), eq(calibrationRuns.status, "accepted"), ne(calibrationRuns.id, runId)))
    .orderBy(desc(calibrationRuns.effectiveAt))
    .limit(1);
  if (previous?.effectiveAt != null && effectiveAt <= previous.effectiveAt) {
    const when = new Date(previous.effectiveAt).toISOString().slice(0, 16).replace("T", " ");
    throw unprocessable(`The probe's previous accepted calibration is from ${when} UTC; this run must take effect after it.`, { effectiveAt: `After the previous accepted calibration (${when} UTC)` });
  }
}

/**
 * Saves the run's verdict. Accepted: the calibration is in force from now (effective_at), and the
 * ingest corrects readings with it from then on. Rejected: a second rejection in a row marks the
 * probe for replacement.
 */
export async function completeRun(db: Db, user: Actor, runId: number, input: CompleteRunInput, now = Date.now()): Promise<SavedRun> {
  const { run, probe } = await inProgress(db, user.orgId, runId);
  const effectiveAt = input.effectiveAt ?? now;
  if (input.effectiveAt !== undefined) await checkEffectiveAt(db, probe, run.id, effectiveAt, now);
  const points = await runPoints(db, run.id);
  const previous = await calibrationInForce(db, probe.id, run.startedAt);
  const progress = progressOf(run, points, previous !== null);
  const pending = progress.steps.find((s) => !s.done && s.key !== "result");
  if (pending) throw conflict(`Finish the ${pending.key} step before saving.`);
  const fit = fitPoints(probe, points, previous);
  const saved = await db.transaction(async (tx) => {
    const lastFinished = await lastFinishedRun(tx, probe.id, run.id);
    const replace = fit.verdict === "rejected" && lastFinished?.status === "rejected";
    const reasons = fit.verdict === "accepted" ? [acceptedReason(fit), ...fit.advice] : fit.reasons;
    const [saved] = await tx
      .update(calibrationRuns)
      .set({
        status: fit.verdict,
        completedAt: now,
        effectiveAt: fit.verdict === "accepted" ? effectiveAt : null,
        slopePct: fit.kind === "ph" ? fit.slopePct : null,
        offsetMv: fit.kind === "ph" ? fit.offsetMv : null,
        cellConstant: fit.kind === "ec" ? fit.cellConstant : null,
        deviationPct: fit.kind === "ec" ? fit.deviationPct : null,
        reasons,
        note: input.note?.trim() || run.note,
      })
      .where(eq(calibrationRuns.id, run.id))
      .returning();
    if (fit.verdict === "accepted" && probe.status === "replace") {
      // An accepted calibration shows the probe is usable again.
      await tx.update(probes).set({ status: "active" }).where(eq(probes.id, probe.id));
    }
    if (replace) {
      await tx.update(probes).set({ status: "replace" }).where(eq(probes.id, probe.id));
      await audit(tx, { orgId: user.orgId, userId: user.id, action: "probe.mark-replace", entity: "probe", entityId: probe.id, detail: { probe: probe.serial, reason: "Rejected twice in a row" }, at: now });
    }
    const late = effectiveAt < now ? { effectiveAt: new Date(effectiveAt).toISOString() } : {};
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "calibration.save", entity: "calibration_run", entityId: run.id, detail: { probe: probe.serial, verdict: fit.verdict, ...late }, at: now });
    return { run: saved, fit, probeMarkedForReplacement: replace };
  });
  // In force from a time in the past (entered late): the readings stored since are corrected again.
  const recomputed = saved.run.status === "accepted" && effectiveAt < now ? await recomputeFrom(db, probe.id, effectiveAt) : null;
  return { ...saved, recomputed };
}

function acceptedReason(fit: Fit): string {
  if (fit.kind === "ph") {
    return `Slope ${fit.slopePct.toFixed(1)} % and offset ${fit.offsetMv.toFixed(1)} mV are within the limits (90–105 %, ±30 mV)`;
  }
  return `Cell constant ${fit.cellConstant.toPrecision(4)} /cm is ${Math.abs(fit.deviationPct).toFixed(1)} % from the nominal ${fit.nominalCellConstant} /cm (limit ±10 %)`;
}

/** Abandons a run in progress (the points stay on record; nothing takes effect). */
export async function abandonRun(db: Db, user: Actor, runId: number, now = Date.now()) {
  const { run, probe } = await inProgress(db, user.orgId, runId);
  await db.transaction(async (tx) => {
    await tx.update(calibrationRuns).set({ status: "abandoned", completedAt: now }).where(eq(calibrationRuns.id, run.id));
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "calibration.abandon", entity: "calibration_run", entityId: run.id, detail: { probe: probe.serial }, at: now });
  });
}

/** Runs in progress in the organisation, to resume. */
export async function runsInProgress(db: Db, orgId: number) {
  const rows = await db.query.calibrationRuns.findMany({
    where: (r, { eq }) => eq(r.status, "in_progress"),
    with: { probe: true, tank: { with: { site: true } } },
    orderBy: (r, { desc }) => desc(r.startedAt),
  });
  return rows.filter((r) => r.tank.site.orgId === orgId);
}
