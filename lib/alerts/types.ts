/**
 * Shared types of the alert rule engine. Units everywhere: pH, EC in mS/cm,
 * solution temperature in °C, times in ms since the Unix epoch.
 */

export type Measure = "ph" | "ec" | "temp";
export const MEASURES: readonly Measure[] = ["ph", "ec", "temp"];

export type Cause =
  | "out-of-band"
  | "rate-of-change"
  | "stale"
  | "flatline"
  | "implausible"
  | "calibration-due-soon"
  | "calibration-lapsed"
  | "calibration-rejected"
  | "probe-replace"
  | "buffer-like"
  | "out-of-solution"
  | "hold-overrun"
  | "dosing-inhibit-overrun";

export const CAUSES: readonly Cause[] = [
  "out-of-band",
  "rate-of-change",
  "stale",
  "flatline",
  "implausible",
  "calibration-due-soon",
  "calibration-lapsed",
  "calibration-rejected",
  "probe-replace",
  "buffer-like",
  "out-of-solution",
  "hold-overrun",
  "dosing-inhibit-overrun",
];

/** Causes evaluated by `evaluateReading` (one per corrected reading). */
export type ReadingCause =
  | "out-of-band"
  | "rate-of-change"
  | "flatline"
  | "implausible"
  | "buffer-like"
  | "out-of-solution";

export const READING_CAUSES: readonly ReadingCause[] = [
  "implausible",
  "out-of-band",
  "rate-of-change",
  "flatline",
  "buffer-like",
  "out-of-solution",
];

/** Per-probe causes evaluated by `evaluateTime`. */
export type ProbeTimeCause =
  | "stale"
  | "calibration-due-soon"
  | "calibration-lapsed"
  | "calibration-rejected"
  | "probe-replace";

export const PROBE_TIME_CAUSES: readonly ProbeTimeCause[] = [
  "stale",
  "calibration-due-soon",
  "calibration-lapsed",
  "calibration-rejected",
  "probe-replace",
];

/** Per-tank causes evaluated by `evaluateTime`. */
export type TankCause = "hold-overrun" | "dosing-inhibit-overrun";
export const TANK_CAUSES: readonly TankCause[] = ["hold-overrun", "dosing-inhibit-overrun"];

export type Severity = "warning" | "critical";

export type ReadingQuality = "ok" | "held" | "uncalibrated" | "lapsed" | "suspect";

export type CalibrationStatus = "current" | "due-soon" | "lapsed" | "never";

export interface Band {
  min: number;
  max: number;
}

export interface AlertEvent {
  type: "fire" | "clear";
  cause: Cause;
  /** The probe's measure; `null` for tank-level causes (hold-overrun, dosing-inhibit-overrun). */
  measure: Measure | null;
  /** Probe id when the caller supplied one (always set by `evaluateTime` for probe causes). */
  probeId?: string;
  /** Reading timestamp (evaluateReading) or `now` (evaluateTime), ms epoch. */
  at: number;
  /** The corrected reading value that caused the transition, when there is one. */
  value?: number;
  message: string;
  /** True when the probe's calibration is lapsed or it was never calibrated. */
  calibrationLapsed: boolean;
  severity: Severity;
}
