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
import { advanceTracker, forceClear, suspendTracker, transitionOf, type Condition } from "./tracker";
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

const NO_DELAY = { fireDelayMs: 0, clearDelayMs: 0 };

const finite = (v: number | null | undefined): number | null =>
  typeof v === "number" && Number.isFinite(v) ? v : null;

/**
 * States this function returned carry this brand. It never mutates its input and builds every
 * returned state from fresh objects, so a branded state needs no `restoreProbeState` when it
 * comes back as the next reading's input (the alert runner passes them straight on; restoring
 * each reading's state again was a large share of the ingest's CPU per reading). A symbol key is
 * not persisted (JSON leaves it out), so a state read back from the database is always restored.
 */
const EVALUATED: unique symbol = Symbol("evaluated");
type BrandedState = ProbeAlertState & { [EVALUATED]?: true };

function finished(state: ProbeAlertState, events: AlertEvent[]): EvaluateReadingResult {
  (state as BrandedState)[EVALUATED] = true;
  return { state, events };
}

function previousState(state: EvaluateReadingInput["state"]): ProbeAlertState {
  return typeof state === "object" && state !== null && (state as BrandedState)[EVALUATED] === true ? state : restoreProbeState(state);
}

/** What one evaluation's rule steps share (built once per reading). */
interface RuleStep {
  settings: RuleSettings;
  next: ProbeAlertState;
  events: AlertEvent[];
  measure: Measure;
  probeId: string | undefined;
  ts: number;
  value: number | null;
  untrusted: CalibrationStatus | null;
}

/** The events' shared fields, built only when a rule fires or clears. */
function eventContext(s: RuleStep): EventContext {
  return { measure: s.measure, probeId: s.probeId, at: s.ts, calibrationLapsed: s.untrusted !== null, settings: s.settings };
}

function suspendAll(next: ProbeAlertState, settings: RuleSettings) {
  for (const c of READING_CAUSES) if (settings.causes[c].enabled) next.causes[c] = suspendTracker(next.causes[c]);
}

/** Steps one enabled rule's tracker; returns the transition, for the caller to word (`emit`). */
function runRule(s: RuleStep, cause: ReadingCause, cond: Condition | null, delays: { fireDelayMs: number; clearDelayMs: number }): "fire" | "clear" | null {
  if (!s.settings.causes[cause].enabled) return null;
  const before = s.next.causes[cause];
  const after = advanceTracker(before, cond, s.ts, delays.fireDelayMs, delays.clearDelayMs);
  if (after === before) return null;
  s.next.causes[cause] = after;
  return transitionOf(before, after);
}

/** Records a transition's event; a firing reading notes an untrusted calibration unless told not to. */
function emit(s: RuleStep, transition: "fire" | "clear", cause: ReadingCause, message: string, withNote = true) {
  const text = transition === "fire" && withNote ? message + calibrationNote(s.untrusted) : message;
  s.events.push(makeEvent(eventContext(s), transition, cause, text, s.value));
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
    return finished(prev, []);
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
  const events: AlertEvent[] = [];
  // Each rule's message is worded only when it fires or clears (not built for every reading).
  const step: RuleStep = { settings, next, events, measure, probeId: input.probeId, ts, value, untrusted };

  // Disabled rules never fire; one that was firing is cleared (closes its incident).
  for (const c of READING_CAUSES) {
    if (settings.causes[c].enabled) continue;
    const r = forceClear(next.causes[c]);
    next.causes[c] = r.tracker;
    if (r.transition === "clear") {
      events.push(makeEvent(eventContext(step), "clear", c, `${describeCause(c)} rule disabled`, value));
      if (c === "out-of-band") next.bandSide = null;
    }
  }
  // ---- hold: silence everything, forget held readings --------------------------------
  if (tank.hold.active || quality === "held") {
    suspendAll(next, settings);
    next.history = [];
    next.flat = null;
    return finished(next, events);
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
    suspendAll(next, settings);
    return finished(next, events);
  }

  // ---- rules -------------------------------------------------------------------------------

  const impl = runRule(step, "implausible", implausibleCondition(value, quality, range), settings.implausible);
  if (impl) emit(step, impl, "implausible", impl === "fire" ? implausibleFireMessage(measure, value, range) : implausibleClearMessage(measure, value));

  const band = tank.band[measure] ?? null;
  const oob = usable ? outOfBandCondition(value, band, settings.outOfBand.hysteresisFraction) : null;
  const oobT = runRule(step, "out-of-band", oob, settings.outOfBand);
  if (oobT === "fire") {
    next.bandSide = oob?.side ?? null;
    emit(step, oobT, "out-of-band", outOfBandFireMessage(measure, value as number, band as Band, oob?.side ?? "above"));
  } else if (oobT === "clear") {
    next.bandSide = null;
    emit(step, oobT, "out-of-band", outOfBandClearMessage(measure, value as number, band));
  }

  const maxRate = settings.rateOfChange.maxPerMinute[measure];
  const rateT = runRule(step, "rate-of-change", usable && !dry ? rateCondition(rate, maxRate) : null, settings.rateOfChange);
  if (rateT) emit(step, rateT, "rate-of-change", rateT === "fire" ? rateFireMessage(measure, value as number, rate as number, maxRate) : rateClearMessage(measure, value as number, maxRate));

  const flat = next.flat;
  const flatT = runRule(
    step,
    "flatline",
    raw !== null ? flatlineCondition(flat, ts, settings.flatline.windowMs[measure], settings.flatline.minSamples) : null,
    NO_DELAY,
  );
  // A stuck raw signal is not about calibration: no note.
  if (flatT) emit(step, flatT, "flatline", flatT === "fire" ? (flat ? flatlineFireMessage(measure, flat, ts) : "") : flatlineClearMessage(measure), false);

  if (measure === "ph") {
    const bl = settings.bufferLike;
    const buffer = usable ? nearExcludedBuffer(value, band, bl.buffers, bl.tolerance) : null;
    const pendingSince = next.causes["buffer-like"].pendingSince ?? ts;
    const blT = runRule(step, "buffer-like", usable ? bufferLikeCondition(buffer) : null, bl);
    if (blT) emit(step, blT, "buffer-like", blT === "fire" ? bufferLikeFireMessage(value as number, buffer as number, band as Band, ts - pendingSince) : bufferLikeClearMessage(value as number));
  }

  if (measure === "ec") {
    const os = settings.outOfSolution;
    const osT = runRule(step, "out-of-solution", usable ? outOfSolutionCondition(value, os.maxEc) : null, os);
    if (osT) emit(step, osT, "out-of-solution", osT === "fire" ? outOfSolutionFireMessage(value as number) : outOfSolutionClearMessage(value as number, os.maxEc));
  }

  return finished(next, events);
}
