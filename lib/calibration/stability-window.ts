import { CalibrationInputError } from "./errors";

/** DOMAIN.md: the reading must hold for 30 s ("configurable"). */
export const DEFAULT_STABILITY_WINDOW_MS = 30_000;
const MIN_WINDOW_MS = 1_000;
const MAX_WINDOW_MS = 10 * 60_000;

/**
 * The stability window from its setting (a whole number of ms, e.g. the environment's
 * CALIBRATION_STABILITY_WINDOW_MS); unset or empty means the default. A value that is not a
 * whole number between 1 s and 10 min is refused rather than silently replaced.
 */
export function parseStabilityWindowMs(setting: string | undefined): number {
  if (setting === undefined || setting.trim() === "") return DEFAULT_STABILITY_WINDOW_MS;
  const ms = Number(setting);
  if (!Number.isInteger(ms) || ms < MIN_WINDOW_MS || ms > MAX_WINDOW_MS) {
    throw new CalibrationInputError("invalid-parameter", `The stability window "${setting}" must be a whole number of ms between ${MIN_WINDOW_MS} and ${MAX_WINDOW_MS}`);
  }
  return ms;
}
