import { requireFinite, requireNonNegative, requirePositive } from "./guards";
import { DAY_MS } from "./time";

export type CalibrationStatus = "current" | "due-soon" | "lapsed" | "never";

export interface StatusInput {
  /** Last accepted calibration, ms epoch; null when there has been none. */
  lastAcceptedAt: number | null;
  intervalDays: number;
  /** ms epoch. */
  now: number;
  /** Days before the due time at which the status turns "due-soon" (default 5). */
  dueSoonDays?: number;
}

/**
 * Calibration status at `now`. Due at lastAcceptedAt + intervalDays; "lapsed"
 * from the due time on, "due-soon" within dueSoonDays before it.
 */
export function calibrationStatus({
  lastAcceptedAt,
  intervalDays,
  now,
  dueSoonDays = 5,
}: StatusInput): CalibrationStatus {
  const interval = requirePositive(intervalDays, "The calibration interval");
  const soon = requireNonNegative(dueSoonDays, "The due-soon period");
  const t = requireFinite(now, "The current time");
  if (lastAcceptedAt === null) return "never";
  const last = requireFinite(lastAcceptedAt, "The last accepted calibration time");
  const dueAt = last + interval * DAY_MS;
  if (t >= dueAt) return "lapsed";
  if (t >= dueAt - soon * DAY_MS) return "due-soon";
  return "current";
}
