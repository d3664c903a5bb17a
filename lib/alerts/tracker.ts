import type { CauseTracker } from "./state";

/**
 * What a rule says about one evaluation:
 * - `active`: the firing condition holds now;
 * - `clearOk`: the clearing condition holds now (may be stricter than `!active`, e.g.
 *   hysteresis). A rule that cannot judge (no value, no history) returns `null`.
 */
export interface Condition {
  active: boolean;
  clearOk: boolean;
}

export interface StepOptions {
  at: number;
  fireDelayMs: number;
  clearDelayMs: number;
  /** False while alerts are silenced (hold): the tracker may clear but never fires. */
  allowFire?: boolean;
}

export type Transition = "fire" | "clear" | null;

export interface StepResult {
  tracker: CauseTracker;
  transition: Transition;
}

/**
 * Debounced fire/clear: fires once the condition has held for `fireDelayMs`
 * (0 ⇒ on the first evaluation), clears once the clearing condition has held for
 * `clearDelayMs`. A firing tracker never fires again and a quiet one never clears,
 * so repeated evaluation of the same situation produces no further transitions.
 */
export function stepTracker(t: CauseTracker, cond: Condition | null, o: StepOptions): StepResult {
  // Every tracker is built as a literal with the same four fields (not spread): this runs for
  // each rule of each reading, and literals of one shape are what V8 builds fastest.
  if (cond === null) return { tracker: tracker(t.firing, t.firedAt, t.pendingSince, t.clearingSince), transition: null };
  const allowFire = o.allowFire ?? true;
  if (!t.firing) {
    if (!cond.active || !allowFire) {
      return { tracker: tracker(t.firing, t.firedAt, null, null), transition: null };
    }
    const pendingSince = t.pendingSince ?? o.at;
    if (o.at - pendingSince >= o.fireDelayMs) {
      return { tracker: tracker(true, o.at, null, null), transition: "fire" };
    }
    return { tracker: tracker(t.firing, t.firedAt, pendingSince, null), transition: null };
  }
  if (!cond.clearOk) {
    return { tracker: tracker(t.firing, t.firedAt, null, null), transition: null };
  }
  const clearingSince = t.clearingSince ?? o.at;
  if (o.at - clearingSince >= o.clearDelayMs) {
    return { tracker: tracker(false, null, null, null), transition: "clear" };
  }
  return { tracker: tracker(t.firing, t.firedAt, null, clearingSince), transition: null };
}

function tracker(firing: boolean, firedAt: number | null, pendingSince: number | null, clearingSince: number | null): CauseTracker {
  return { firing, firedAt, pendingSince, clearingSince };
}

/** Silenced (hold, settling): forget pending timers, keep a firing cause firing. */
export function suspendTracker(t: CauseTracker): CauseTracker {
  return tracker(t.firing, t.firedAt, null, null);
}

/** Unconditional clear (rule disabled). Reports "clear" only if it was firing. */
export function forceClear(t: CauseTracker): StepResult {
  return {
    tracker: { firing: false, firedAt: null, pendingSince: null, clearingSince: null },
    transition: t.firing ? "clear" : null,
  };
}
