import { CalibrationInputError } from "./errors";

/** Throws unless `value` is a finite number. `name` appears in the message. */
export function requireFinite(value: unknown, name: string): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    const what =
      typeof value === "number"
        ? Number.isNaN(value)
          ? "is not a number"
          : "is infinite"
        : value === undefined || value === null
          ? "is missing"
          : `must be a number, not ${typeof value}`;
    throw new CalibrationInputError("non-finite", `${name} ${what}; enter a finite number`);
  }
  return value;
}

/** Throws unless `value` is a finite number greater than zero. */
export function requirePositive(value: unknown, name: string): number {
  const v = requireFinite(value, name);
  if (v <= 0) {
    throw new CalibrationInputError(
      "invalid-parameter",
      `${name} must be greater than zero, got ${v}`,
    );
  }
  return v;
}

/** Throws unless `value` is a finite number of zero or more. */
export function requireNonNegative(value: unknown, name: string): number {
  const v = requireFinite(value, name);
  if (v < 0) {
    throw new CalibrationInputError(
      "invalid-parameter",
      `${name} must not be negative, got ${v}`,
    );
  }
  return v;
}

/**
 * Throws unless `value` is a usable slope in percent of Nernstian: finite and
 * strictly positive (a zero slope would divide by zero in every reading).
 */
export function requireSlopePct(value: unknown, name: string): number {
  const v = requireFinite(value, name);
  if (v === 0) {
    throw new CalibrationInputError(
      "zero-slope",
      `${name} is 0 %: a probe with no slope cannot give a reading; recalibrate the probe`,
    );
  }
  if (v < 0) {
    throw new CalibrationInputError(
      "negative-slope",
      `${name} is ${v} %: a negative slope is not a valid calibration; recalibrate the probe`,
    );
  }
  return v;
}
