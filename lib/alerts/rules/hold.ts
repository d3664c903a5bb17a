import { formatDuration } from "../format";
import { conditionOf, type Condition } from "../tracker";

export interface HoldInfo {
  active: boolean;
  /**
   * Set when the active hold covers single probes only (a probe out for cleaning): those
   * probes' rules are silent, the tank's other probes keep alerting. Unset: the whole tank.
   */
  probeIds?: readonly string[] | null;
  placedAt?: number | null;
  plannedEndAt?: number | null;
  releasedAt?: number | null;
}

export interface DosingInhibitInfo {
  active: boolean;
  plannedEndAt?: number | null;
}

/** How far past its planned end an active hold is (≤ 0 ⇒ not overrunning); `null` if no plan. */
export function holdOverrunMs(now: number, hold: HoldInfo): number | null {
  if (!hold.active || hold.plannedEndAt == null) return null;
  return now - hold.plannedEndAt;
}

export function holdOverrunCondition(now: number, hold: HoldInfo, graceMs: number): Condition {
  const over = holdOverrunMs(now, hold);
  const active = over !== null && over > graceMs;
  return conditionOf(active);
}

/**
 * How long dosing has been inhibited beyond what was planned: past the inhibit's
 * own planned end, or, once the hold is released, past the release (the inhibit
 * should have been lifted with the hold). `null` when not inhibited or no reference.
 */
export function dosingInhibitOverrunMs(now: number, inhibit: DosingInhibitInfo, hold: HoldInfo): number | null {
  if (!inhibit.active) return null;
  const refs: number[] = [];
  if (inhibit.plannedEndAt != null) refs.push(inhibit.plannedEndAt);
  if (!hold.active && hold.releasedAt != null) refs.push(hold.releasedAt);
  if (refs.length === 0) return null;
  return now - Math.min(...refs);
}

export function dosingInhibitOverrunCondition(
  now: number,
  inhibit: DosingInhibitInfo,
  hold: HoldInfo,
  graceMs: number,
): Condition {
  const over = dosingInhibitOverrunMs(now, inhibit, hold);
  const active = over !== null && over > graceMs;
  return conditionOf(active);
}

export function holdOverrunFireMessage(overMs: number): string {
  return `Hold has run ${formatDuration(overMs)} past its planned end — release or extend it`;
}

export function holdOverrunClearMessage(hold: HoldInfo): string {
  return hold.active ? "Hold extended; no longer past its planned end" : "Hold released";
}

export function dosingInhibitFireMessage(overMs: number, holdActive: boolean): string {
  return holdActive
    ? `Dosing inhibited ${formatDuration(overMs)} longer than planned`
    : `Dosing still inhibited ${formatDuration(overMs)} after it should have resumed — check the controller`;
}

export function dosingInhibitClearMessage(inhibitActive: boolean): string {
  return inhibitActive ? "Dosing inhibit extended; no longer past its planned end" : "Dosing resumed";
}
