import type { Cause } from "./types";

export const CAUSE_LABELS: Readonly<Record<Cause, string>> = Object.freeze({
  "out-of-band": "Out of band",
  "rate-of-change": "Changing too fast",
  stale: "Stale data",
  flatline: "Flatline",
  implausible: "Implausible reading",
  "calibration-due-soon": "Calibration due soon",
  "calibration-lapsed": "Calibration lapsed",
  "calibration-rejected": "Calibration rejected",
  "probe-replace": "Replace probe",
  "buffer-like": "Reading looks like a buffer",
  "out-of-solution": "Probe out of solution",
  "hold-overrun": "Hold overrunning",
  "dosing-inhibit-overrun": "Dosing inhibited too long",
});

/** Short human label of a cause for the UI. */
export function describeCause(cause: Cause): string {
  return CAUSE_LABELS[cause] ?? cause;
}
