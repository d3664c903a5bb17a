/**
 * The one error type of lib/calibration. Every impossible input throws a
 * CalibrationInputError with a stable `code` (for the app to branch on) and a
 * message a grower can read. No function in this library returns NaN.
 */
export type CalibrationErrorCode =
  | "non-finite"
  | "point-count"
  | "duplicate-buffer"
  | "buffers-too-close"
  | "temperature-out-of-range"
  | "unknown-buffer"
  | "invalid-table"
  | "unknown-standard"
  | "non-positive-conductance"
  | "zero-slope"
  | "negative-slope"
  | "invalid-parameter";

export class CalibrationInputError extends Error {
  readonly code: CalibrationErrorCode;

  constructor(code: CalibrationErrorCode, message: string) {
    super(message);
    this.name = "CalibrationInputError";
    this.code = code;
    Object.setPrototypeOf(this, new.target.prototype);
  }
}
