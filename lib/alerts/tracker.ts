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

/** A condition that holds now (and so cannot clear), and one that is clear: shared, never changed. */
export const ACTIVE: Readonly<Condition> = Object.freeze({ active: true, clearOk: false });
export const CLEAR: Readonly<Condition> = Object.freeze({ active: false, clearOk: true });
/** `ACTIVE` when `active`, else `CLEAR`: for rules whose clearing condition is just "not active". */
export const conditionOf = (active: boolean): Readonly<Condition> => (active ? ACTIVE : CLEAR);

/**
 * Debounced fire/clear: fires once the condition has held for `fireDelayMs`
 * (0 ⇒ on the first evaluation), clears once the clearing condition has held for
 * `clearDelayMs`. A firing tracker never fires again and a quiet one never clears,
 * so repeated evaluation of the same situation produces no further transitions.
 */
export function stepTracker(t: CauseTracker, cond: Condition | null, o: StepOptions): StepResult {
  const tracker = advanceTracker(t, cond, o.at, o.fireDelayMs, o.clearDelayMs, o.allowFire ?? true);
  return { tracker, transition: transitionOf(t, tracker) };
}

/** "fire" or "clear" when a step from `before` to `after` changed whether the cause fires. */
export function transitionOf(before: CauseTracker, after: CauseTracker): Transition {
  if (before.firing === after.firing) return null;
  return after.firing ? "fire" : "clear";
}

/**
 * The tracker after one step (see stepTracker). Trackers are never changed in place, so when the
 * step changes nothing `t` itself comes back: this runs for each rule of every reading, and most
 * steps of a quiet probe change nothing.
 */
export function advanceTracker(t: CauseTracker, cond: Condition | null, at: number, fireDelayMs: number, clearDelayMs: number, allowFire = true): CauseTracker {
  if (cond === null) return t;
  if (!t.firing) {
    if (!cond.active || !allowFire) return t.pendingSince === null && t.clearingSince === null ? t : tracker(false, t.firedAt, null, null);
    const pendingSince = t.pendingSince ?? at;
    if (at - pendingSince >= fireDelayMs) return tracker(true, at, null, null);
    return t.pendingSince === pendingSince && t.clearingSince === null ? t : tracker(false, t.firedAt, pendingSince, null);
  }
  if (!cond.clearOk) return t.pendingSince === null && t.clearingSince === null ? t : tracker(true, t.firedAt, null, null);
  const clearingSince = t.clearingSince ?? at;
  if (at - clearingSince >= clearDelayMs) return tracker(false, null, null, null);
  return t.clearingSince === clearingSince && t.pendingSince === null ? t : tracker(true, t.firedAt, null, clearingSince);
}

// Every tracker is built as a literal with the same four fields (not spread): literals of one
// shape are what V8 builds fastest.
function tracker(firing: boolean, firedAt: number | null, pendingSince: number | null, clearingSince: number | null): CauseTracker {
  return { firing, firedAt, pendingSince, clearingSince };
}

/** Silenced (hold, settling): forget pending timers, keep a firing cause firing. */
export function suspendTracker(t: CauseTracker): CauseTracker {
  return t.pendingSince === null && t.clearingSince === null ? t : tracker(t.firing, t.firedAt, null, null);
}

/** Unconditional clear (rule disabled). Reports "clear" only if it was firing. */
export function forceClear(t: CauseTracker): StepResult {
  const quiet = !t.firing && t.firedAt === null && t.pendingSince === null && t.clearingSince === null;
  return { tracker: quiet ? t : tracker(false, null, null, null), transition: t.firing ? "clear" : null };
}
