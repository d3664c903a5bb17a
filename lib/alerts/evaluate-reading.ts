import { makeEvent, type EventContext } from "./events";
import { describeCause } from "./describe";
import { calibrationNote } from "./format";
import { isWithin } from "./ranges";
import { bufferLikeClearMessage, bufferLikeCondition, bufferLikeFireMessage, nearExcludedBuffer } from "./rules/buffer-like";
import { flatlineClearMessage, flatlineCondition, flatlineFireMessage, updateFlatRun } from "./rules/flatline";
import { implausibleClearMessage, implausibleCondition, implausibleFireMessage } from "./rules/implausible";
import { outOfBandClearMessage, outOfBandCondition, outOfBandFireMessage } from "./rules/out-of-band";
import { outOfSolutionClearMessage, outOfSolutionCondition, outOfSolutionFireMessage } from "./rules/out-of-solution";
import { rateClearMessage, rateCondition, rateFireMessage, ratePerMinute, updateHistory } from "./rules/rate-of-change";
import { DEFAULT_RULE_SETTINGS, type RuleSettings } from "./settings";
import { restoreProbeState, type ProbeAlertState } from "./state";
import { forceClear, stepTracker, suspendTracker, type Condition } from "./tracker";
import type { AlertEvent, Band, CalibrationStatus, Measure, ReadingCause, ReadingQuality } from "./types";
import { READING_CAUSES } from "./types";

export interface ReadingInput {
  /** Time the reading was taken, ms epoch. */
  ts: number;
  /** Corrected value (pH, mS/cm EC25, °C); `null` when it could not be corrected. */
  value: number | null;
  /** Raw device signal (pH mV, EC conductance µS, temp °C); used by flatline only. */
  raw: number | null;
  measure: Measure;
  quality: ReadingQuality;
}

export interface ReadingTankContext {
  /** Target band per measure; a missing band disables out-of-band and buffer-like for it. */
  band: Partial<Record<Measure, Band | null>>;
  /** `releasedAt`: when the last hold ended (released or expired), starts the settling period. */
  hold: { active: boolean; releasedAt?: number | null };
}

export interface EvaluateReadingInput {
  /** The probe's persisted state; `null`/`undefined` for a probe never evaluated. */
  state: ProbeAlertState | null | undefined;
  /** Copied onto every event when given. */
  probeId?: string;
  reading: ReadingInput;
  tank: ReadingTankContext;
  calibration: { status: CalibrationStatus };
  settings?: RuleSettings;
}

export interface EvaluateReadingResult {
  state: ProbeAlertState;
  events: AlertEvent[];
}

const finite = (v: number | null | undefined): number | null =>
  typeof v === "number" && Number.isFinite(v) ? v : null;

/**
 * States this function returned. It never mutates its input and builds every returned state
 * from fresh objects, so one of them needs no `restoreProbeState` when it comes back as the
 * next reading's input (the alert runner passes them straight on; restoring each reading's state
 * again was a large share of the ingest's CPU per reading).
 */
const evaluated = new WeakSet<object>();

function finished(result: EvaluateReadingResult): EvaluateReadingResult {
  evaluated.add(result.state);
  return result;
}

function previousState(state: EvaluateReadingInput["state"]): ProbeAlertState {
  return typeof state === "object" && state !== null && evaluated.has(state) ? state : restoreProbeState(state);
}

/** What one evaluation's rule steps share (built once per reading instead of a closure per reading). */
interface RuleStep {
  settings: RuleSettings;
  next: ProbeAlertState;
  ctx: EventContext;
  events: AlertEvent[];
  ts: number;
  value: number | null;
  note: string;
}

function suspendAll(next: ProbeAlertState, enabled: readonly ReadingCause[]) {
  for (const c of enabled) next.causes[c] = suspendTracker(next.causes[c]);
}

function runRule(
  s: RuleStep,
  cause: ReadingCause,
  cond: Condition | null,
  delays: { fireDelayMs: number; clearDelayMs: number },
  fireMessage: () => string,
  clearMessage: () => string,
  withNote = true,
): "fire" | "clear" | null {
  if (!s.settings.causes[cause].enabled) return null;
  const r = stepTracker(s.next.causes[cause], cond, { at: s.ts, fireDelayMs: delays.fireDelayMs, clearDelayMs: delays.clearDelayMs });
  s.next.causes[cause] = r.tracker;
  if (r.transition === "fire") {
    s.events.push(makeEvent(s.ctx, "fire", cause, fireMessage() + (withNote ? s.note : ""), s.value));
  } else if (r.transition === "clear") {
    s.events.push(makeEvent(s.ctx, "clear", cause, clearMessage(), s.value));
  }
  return r.transition;
}

/** Which "not trusted" status to report: the probe's status, else the reading's flag. */
function untrustedStatus(status: CalibrationStatus, quality: ReadingQuality): CalibrationStatus | null {
  if (status === "lapsed" || status === "never") return status;
  if (quality === "lapsed") return "lapsed";
  if (quality === "uncalibrated") return "never";
  return null;
}

/**
 * Evaluates the reading rules (implausible, out-of-band, rate-of-change, flatline,
 * buffer-like, out-of-solution) for one corrected reading of one probe. Pure: the
 * input state is not mutated; persist the returned state together with the events.
 *
 * - A reading not newer than the last one evaluated (duplicate or out of order) is
 *   ignored: same state, no events.
 * - On hold (tank hold active or reading quality "held") nothing fires and nothing
 *   clears: causes already firing stay firing ("held") and pending timers restart;
 *   rate/flatline history is dropped (held readings are buffer or cleaning solution).
 * - During the settling period after a release, history is rebuilt but nothing fires
 *   or clears; afterwards rules run normally (delays count from the end of settling).
 * - Implausible values ("suspect" or outside the physical range) raise "implausible"
 *   and are not used by the band, rate, buffer-like and out-of-solution rules.
 * - EC readings below the out-of-solution threshold are not used by rate-of-change.
 */
export function evaluateReading(input: EvaluateReadingInput): EvaluateReadingResult {
  const settings = input.settings ?? DEFAULT_RULE_SETTINGS;
  const prev = previousState(input.state);
  const { reading, tank } = input;
  const ts = finite(reading.ts);
  if (ts === null || (prev.lastTs !== null && ts <= prev.lastTs)) {
    return finished({ state: prev, events: [] });
  }
  const { measure, quality } = reading;
  const value = finite(reading.value);
  const raw = finite(reading.raw);

  const next: ProbeAlertState = {
    version: 1,
    causes: { ...prev.causes },
    lastTs: ts,
    lastValue: value,
    lastRaw: raw,
    bandSide: prev.bandSide,
    history: prev.history,
    flat: prev.flat,
  };
  const untrusted = untrustedStatus(input.calibration.status, quality);
  const ctx: EventContext = {
    measure,
    probeId: input.probeId,
    at: ts,
    calibrationLapsed: untrusted !== null,
    settings,
  };
  const events: AlertEvent[] = [];

  // Disabled rules never fire; one that was firing is cleared (closes its incident).
  const enabled = READING_CAUSES.filter((c) => settings.causes[c].enabled);
  for (const c of READING_CAUSES) {
    if (enabled.includes(c)) continue;
    const r = forceClear(next.causes[c]);
    next.causes[c] = r.tracker;
    if (r.transition === "clear") {
      events.push(makeEvent(ctx, "clear", c, `${describeCause(c)} rule disabled`, value));
      if (c === "out-of-band") next.bandSide = null;
    }
  }
  // ---- hold: silence everything, forget held readings --------------------------------
  if (tank.hold.active || quality === "held") {
    suspendAll(next, enabled);
    next.history = [];
    next.flat = null;
    return finished({ state: next, events });
  }

  // ---- track history (also while settling) ---------------------------------------------
  const range = settings.implausible.ranges[measure];
  const usable = value !== null && quality !== "suspect" && isWithin(value, range);
  // A dry EC probe says nothing about the tank: its readings neither count as a
  // fast change nor stay in the history (so going back into solution is no jump).
  const dry = measure === "ec" && usable && value < settings.outOfSolution.maxEc;
  let rate: number | null = null;
  if (dry) {
    next.history = [];
  } else if (usable) {
    const rs = settings.rateOfChange;
    rate = ratePerMinute(prev.history, ts, value, rs.windowMs);
    next.history = updateHistory(prev.history, { ts, value }, rs.windowMs, rs.sampleIntervalMs);
  }
  if (raw !== null) {
    next.flat = updateFlatRun(prev.flat, ts, raw, settings.flatline.epsilonRaw[measure]);
  }

  // ---- settling after release ------------------------------------------------------------
  const releasedAt = finite(tank.hold.releasedAt);
  if (releasedAt !== null && ts < releasedAt + settings.settling.afterReleaseMs) {
    suspendAll(next, enabled);
    return finished({ state: next, events });
  }

  // ---- rules -------------------------------------------------------------------------------
  const step: RuleStep = { settings, next, ctx, events, ts, value, note: calibrationNote(untrusted) };

  runRule(
    step,
    "implausible",
    implausibleCondition(value, quality, range),
    settings.implausible,
    () => implausibleFireMessage(measure, value, range),
    () => implausibleClearMessage(measure, value),
  );

  const band = tank.band[measure] ?? null;
  const oob = usable ? outOfBandCondition(value, band, settings.outOfBand.hysteresisFraction) : null;
  const oobT = runRule(
    step,
    "out-of-band",
    oob,
    settings.outOfBand,
    () => outOfBandFireMessage(measure, value as number, band as Band, oob?.side ?? "above"),
    () => outOfBandClearMessage(measure, value as number, band),
  );
  if (oobT === "fire") next.bandSide = oob?.side ?? null;
  if (oobT === "clear") next.bandSide = null;

  const maxRate = settings.rateOfChange.maxPerMinute[measure];
  runRule(
    step,
    "rate-of-change",
    usable && !dry ? rateCondition(rate, maxRate) : null,
    settings.rateOfChange,
    () => rateFireMessage(measure, value as number, rate as number, maxRate),
    () => rateClearMessage(measure, value as number, maxRate),
  );

  const flat = next.flat;
  runRule(
    step,
    "flatline",
    raw !== null ? flatlineCondition(flat, ts, settings.flatline.windowMs[measure], settings.flatline.minSamples) : null,
    { fireDelayMs: 0, clearDelayMs: 0 },
    () => (flat ? flatlineFireMessage(measure, flat, ts) : ""),
    () => flatlineClearMessage(measure),
    false, // a stuck raw signal is not about calibration
  );

  if (measure === "ph") {
    const bl = settings.bufferLike;
    const buffer = usable ? nearExcludedBuffer(value, band, bl.buffers, bl.tolerance) : null;
    const pendingSince = next.causes["buffer-like"].pendingSince ?? ts;
    runRule(
    step,
      "buffer-like",
      usable ? bufferLikeCondition(buffer) : null,
      bl,
      () => bufferLikeFireMessage(value as number, buffer as number, band as Band, ts - pendingSince),
      () => bufferLikeClearMessage(value as number),
    );
  }

  if (measure === "ec") {
    const os = settings.outOfSolution;
    runRule(
    step,
      "out-of-solution",
      usable ? outOfSolutionCondition(value, os.maxEc) : null,
      os,
      () => outOfSolutionFireMessage(value as number),
      () => outOfSolutionClearMessage(value as number, os.maxEc),
    );
  }

  return finished({ state: next, events });
}
