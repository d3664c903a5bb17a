import type { Cause, ProbeTimeCause, ReadingCause, TankCause } from "./types";
import { PROBE_TIME_CAUSES, READING_CAUSES, TANK_CAUSES } from "./types";

/**
 * Debounce state of one cause. Plain JSON: persist it as is.
 * - `pendingSince`: when the firing condition started to hold (not yet firing).
 * - `clearingSince`: when the clearing condition started to hold (while firing).
 */
export interface CauseTracker {
  firing: boolean;
  firedAt: number | null;
  pendingSince: number | null;
  clearingSince: number | null;
}

export interface RateSample {
  ts: number;
  value: number;
}

/** Current run of raw readings whose range stays within the flatline epsilon. */
export interface FlatRun {
  since: number;
  min: number;
  max: number;
  count: number;
}

/** Per-probe evaluation state shared by `evaluateReading` and `evaluateTime`. */
export interface ProbeAlertState {
  version: 1;
  causes: Record<ReadingCause | ProbeTimeCause, CauseTracker>;
  /** Timestamp, corrected value and raw value of the last accepted reading. */
  lastTs: number | null;
  lastValue: number | null;
  lastRaw: number | null;
  /** Side of the band the value was on when out-of-band fired. */
  bandSide: "above" | "below" | null;
  /** Down-sampled recent corrected values, oldest first (rate of change). */
  history: RateSample[];
  flat: FlatRun | null;
}

export interface TankAlertState {
  version: 1;
  causes: Record<TankCause, CauseTracker>;
}

export function initialTracker(): CauseTracker {
  return { firing: false, firedAt: null, pendingSince: null, clearingSince: null };
}

export function initialProbeState(): ProbeAlertState {
  const causes = {} as Record<ReadingCause | ProbeTimeCause, CauseTracker>;
  for (const c of [...READING_CAUSES, ...PROBE_TIME_CAUSES]) causes[c] = initialTracker();
  return {
    version: 1,
    causes,
    lastTs: null,
    lastValue: null,
    lastRaw: null,
    bandSide: null,
    history: [],
    flat: null,
  };
}

export function initialTankState(): TankAlertState {
  const causes = {} as Record<TankCause, CauseTracker>;
  for (const c of TANK_CAUSES) causes[c] = initialTracker();
  return { version: 1, causes };
}

// ---- restoring persisted (possibly older or partial) state -------------------------

const num = (v: unknown): number | null =>
  typeof v === "number" && Number.isFinite(v) ? v : null;

function restoreTracker(v: unknown): CauseTracker {
  if (typeof v !== "object" || v === null) return initialTracker();
  const o = v as Record<string, unknown>;
  const firing = o.firing === true;
  return {
    firing,
    firedAt: firing ? num(o.firedAt) : null,
    pendingSince: firing ? null : num(o.pendingSince),
    clearingSince: firing ? num(o.clearingSince) : null,
  };
}

function restoreCauses<C extends Cause>(list: readonly C[], v: unknown): Record<C, CauseTracker> {
  const src = typeof v === "object" && v !== null ? (v as Record<string, unknown>) : {};
  const out = {} as Record<C, CauseTracker>;
  for (const c of list) out[c] = restoreTracker(src[c]);
  return out;
}

/**
 * Turns whatever was persisted (JSON.parse output, `null` for a new probe, an
 * older shape) into a complete, fresh `ProbeAlertState`. Never throws. The
 * evaluators call it on their input, so the worker may pass stored JSON directly.
 */
export function restoreProbeState(v: unknown): ProbeAlertState {
  if (typeof v !== "object" || v === null) return initialProbeState();
  const o = v as Record<string, unknown>;
  const history: RateSample[] = Array.isArray(o.history)
    ? o.history.flatMap((s: unknown) => {
        if (typeof s !== "object" || s === null) return [];
        const r = s as Record<string, unknown>;
        const ts = num(r.ts);
        const value = num(r.value);
        return ts !== null && value !== null ? [{ ts, value }] : [];
      })
    : [];
  let flat: FlatRun | null = null;
  if (typeof o.flat === "object" && o.flat !== null) {
    const f = o.flat as Record<string, unknown>;
    const since = num(f.since);
    const min = num(f.min);
    const max = num(f.max);
    const count = num(f.count);
    if (since !== null && min !== null && max !== null && count !== null) {
      flat = { since, min, max, count };
    }
  }
  return {
    version: 1,
    causes: restoreCauses([...READING_CAUSES, ...PROBE_TIME_CAUSES], o.causes),
    lastTs: num(o.lastTs),
    lastValue: num(o.lastValue),
    lastRaw: num(o.lastRaw),
    bandSide: o.bandSide === "above" || o.bandSide === "below" ? o.bandSide : null,
    history,
    flat,
  };
}

export function restoreTankState(v: unknown): TankAlertState {
  if (typeof v !== "object" || v === null) return initialTankState();
  const o = v as Record<string, unknown>;
  return { version: 1, causes: restoreCauses(TANK_CAUSES, o.causes) };
}

/** Causes currently firing for a probe (reading and time causes). */
export function firingCauses(state: ProbeAlertState | TankAlertState): Cause[] {
  return (Object.entries(state.causes) as [Cause, CauseTracker][])
    .filter(([, t]) => t.firing)
    .map(([c]) => c);
}

export function isFiring(state: ProbeAlertState | TankAlertState, cause: Cause): boolean {
  return firingCauses(state).includes(cause);
}
