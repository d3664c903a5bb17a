// Public API of the alert rule engine (pure, synchronous, no I/O).
export type {
  AlertEvent,
  Band,
  CalibrationStatus,
  Cause,
  Measure,
  ProbeTimeCause,
  ReadingCause,
  ReadingQuality,
  Severity,
  TankCause,
} from "./types";
export { CAUSES, MEASURES, PROBE_TIME_CAUSES, READING_CAUSES, TANK_CAUSES } from "./types";

export type { CauseSettings, DeepPartial, RuleSettings } from "./settings";
export { DEFAULT_RULE_SETTINGS, mergeSettings } from "./settings";

export { PHYSICAL_RANGES } from "./ranges";

export type { CauseTracker, FlatRun, ProbeAlertState, RateSample, TankAlertState } from "./state";
export {
  firingCauses,
  initialProbeState,
  initialTankState,
  isFiring,
  restoreProbeState,
  restoreTankState,
} from "./state";

export type {
  EvaluateReadingInput,
  EvaluateReadingResult,
  ReadingInput,
  ReadingTankContext,
} from "./evaluate-reading";
export { evaluateReading } from "./evaluate-reading";

export type {
  EvaluateTimeInput,
  EvaluateTimeResult,
  ProbeCalibrationInfo,
  TimeProbeInput,
} from "./evaluate-time";
export { evaluateTime } from "./evaluate-time";

export type { DosingInhibitInfo, HoldInfo } from "./rules/hold";

export { calibrationStatusAt } from "./calibration-status";
export { CAUSE_LABELS, describeCause } from "./describe";
export { formatDuration } from "./format";
