import type { RuleSettings } from "./settings";
import { DEFAULT_RULE_SETTINGS } from "./settings";
import type { CalibrationStatus } from "./types";

/**
 * Calibration status of a probe at `now`, for callers that know the due date:
 * never (no accepted run) · lapsed (now ≥ dueAt) · due-soon (within
 * `settings.calibration.dueSoonMs` of dueAt) · current. Without a due date an
 * accepted calibration is "current". The evaluators take the status as given.
 */
export function calibrationStatusAt(
  input: { now: number; lastAcceptedAt: number | null; dueAt: number | null },
  settings: RuleSettings = DEFAULT_RULE_SETTINGS,
): CalibrationStatus {
  if (input.lastAcceptedAt === null) return "never";
  if (input.dueAt === null) return "current";
  if (input.now >= input.dueAt) return "lapsed";
  if (input.dueAt - input.now <= settings.calibration.dueSoonMs) return "due-soon";
  return "current";
}
