import { formatDuration, probeLabel } from "../format";
import type { FlatRun } from "../state";
import { conditionOf, type Condition } from "../tracker";
import type { Measure } from "../types";

/**
 * Extends the current flat run with a raw reading, or starts a new run at this
 * reading when the range would exceed `epsilon`. (Restarting at the breaking
 * reading slightly underestimates the run, so flatline may fire a little late,
 * never early.)
 */
export function updateFlatRun(run: FlatRun | null, ts: number, raw: number, epsilon: number): FlatRun {
  if (run === null) return { since: ts, min: raw, max: raw, count: 1 };
  const min = Math.min(run.min, raw);
  const max = Math.max(run.max, raw);
  if (max - min > epsilon) return { since: ts, min: raw, max: raw, count: 1 };
  return { since: run.since, min, max, count: run.count + 1 };
}

export function flatlineCondition(run: FlatRun | null, ts: number, windowMs: number, minSamples: number): Condition {
  const flat = run !== null && run.count >= minSamples && ts - run.since >= windowMs;
  return conditionOf(flat);
}

export function flatlineFireMessage(m: Measure, run: FlatRun, ts: number): string {
  return `${probeLabel(m)} signal unchanged for ${formatDuration(ts - run.since)} — probe may be stuck or disconnected`;
}

export function flatlineClearMessage(m: Measure): string {
  return `${probeLabel(m)} signal moving again`;
}
