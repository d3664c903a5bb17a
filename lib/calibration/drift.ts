import { CalibrationInputError } from "./errors";
import { requireFinite, requirePositive } from "./guards";
import { DAY_MS } from "./time";

export interface AsFoundError {
  /** When the as-found check was made (just before recalibrating), ms epoch. */
  at: number;
  /** As-found reading − buffer pH. */
  errorPh: number;
  /**
   * When the calibration it checks was made, ms epoch. Defaults to the `at` of
   * the previous entry (each as-found check comes with a recalibration); the
   * earliest entry without it is left out of the drift rate.
   */
  previousCalibratedAt?: number;
}

export interface NextDueInput {
  /** The calibration now in use, ms epoch. */
  lastCalibratedAt: number;
  asFoundErrors: readonly AsFoundError[];
  /** The site's maximum interval, days (default 30, common practice). */
  maxIntervalDays?: number;
  /** Projected error at which the probe is due, pH (default 0.1). */
  tolerancePh?: number;
}

export interface NextDue {
  /** Mean drift rate, pH per day; null when no as-found check can be dated. */
  driftPhPerDay: number | null;
  /** ms epoch; never later than lastCalibratedAt + maxIntervalDays. */
  nextDueAt: number;
}

/**
 * Suggests when a probe is next due. Drift rate = mean over the as-found
 * checks of |error| / days since the calibration before it; the due date is
 * when the projected error reaches the tolerance, capped at the maximum
 * interval.
 */
export function suggestNextDue({
  lastCalibratedAt,
  asFoundErrors,
  maxIntervalDays = 30,
  tolerancePh = 0.1,
}: NextDueInput): NextDue {
  const last = requireFinite(lastCalibratedAt, "The last calibration time");
  const maxDays = requirePositive(maxIntervalDays, "The maximum interval");
  const tolerance = requirePositive(tolerancePh, "The drift tolerance");
  if (!Array.isArray(asFoundErrors)) {
    throw new CalibrationInputError("invalid-parameter", "The as-found errors must be a list");
  }

  const entries = asFoundErrors
    .map((e, i) => ({
      at: requireFinite(e.at, `Time of as-found check ${i + 1}`),
      errorPh: requireFinite(e.errorPh, `Error of as-found check ${i + 1}`),
      previousCalibratedAt:
        e.previousCalibratedAt === undefined
          ? undefined
          : requireFinite(e.previousCalibratedAt, `Previous calibration of as-found check ${i + 1}`),
    }))
    .sort((a, b) => a.at - b.at);

  const rates: number[] = [];
  entries.forEach((e, i) => {
    const since = e.previousCalibratedAt ?? (i > 0 ? entries[i - 1].at : undefined);
    if (since === undefined) return;
    const days = (e.at - since) / DAY_MS;
    if (days <= 0) {
      throw new CalibrationInputError(
        "invalid-parameter",
        `As-found check ${i + 1} is not later than the calibration it checks; check the dates`,
      );
    }
    rates.push(Math.abs(e.errorPh) / days);
  });

  const driftPhPerDay = rates.length === 0 ? null : rates.reduce((a, r) => a + r, 0) / rates.length;
  const days =
    driftPhPerDay === null || driftPhPerDay === 0
      ? maxDays
      : Math.min(maxDays, tolerance / driftPhPerDay);
  return { driftPhPerDay, nextDueAt: last + days * DAY_MS };
}
