import { formatDuration, probeLabel } from "../format";
import { conditionOf, type Condition } from "../tracker";
import type { CalibrationStatus, Measure } from "../types";

export function dueSoonCondition(status: CalibrationStatus): Condition {
  return conditionOf(status === "due-soon");
}

/** A probe never calibrated counts as lapsed: its readings are not to be trusted. */
export function lapsedCondition(status: CalibrationStatus): Condition {
  return conditionOf(status === "lapsed" || status === "never");
}

export function rejectedCondition(lastRunRejected: boolean): Condition {
  return conditionOf(lastRunRejected);
}

export function probeReplaceCondition(consecutiveRejections: number, threshold: number): Condition {
  return conditionOf(consecutiveRejections >= threshold);
}

export function dueSoonFireMessage(m: Measure, now: number, dueAt: number | null | undefined): string {
  if (dueAt == null) return `${probeLabel(m)} calibration due soon`;
  return `${probeLabel(m)} calibration due in ${formatDuration(Math.max(0, dueAt - now))}`;
}

export function lapsedFireMessage(
  m: Measure,
  status: CalibrationStatus,
  now: number,
  lastAcceptedAt: number | null,
): string {
  if (status === "never" || lastAcceptedAt === null) {
    return `${probeLabel(m)} has never been calibrated — readings may be off`;
  }
  return `${probeLabel(m)} calibration lapsed (last accepted ${formatDuration(now - lastAcceptedAt)} ago) — readings may be off`;
}

export function rejectedFireMessage(m: Measure, reasons?: readonly string[]): string {
  const why = reasons && reasons.length > 0 ? ` (${reasons.join("; ")})` : "";
  return `${probeLabel(m)} calibration rejected${why} — clean and inspect the probe, then retry`;
}

export function probeReplaceFireMessage(m: Measure, rejections: number): string {
  return `${probeLabel(m)} calibration rejected ${rejections} times in a row — replace the probe`;
}

export const calibrationClearMessages = {
  "calibration-due-soon": (m: Measure) => `${probeLabel(m)} calibration no longer due soon`,
  "calibration-lapsed": (m: Measure) => `${probeLabel(m)} calibration current again`,
  "calibration-rejected": (m: Measure) => `${probeLabel(m)} calibration accepted`,
  "probe-replace": (m: Measure) => `${probeLabel(m)} no longer due for replacement`,
} as const;
