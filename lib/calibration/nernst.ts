import { CalibrationInputError } from "./errors";
import { requireFinite } from "./guards";

/** Molar gas constant, J/(mol K). CODATA 2018 (exact). */
export const GAS_CONSTANT = 8.314462618;
/** Faraday constant, C/mol. CODATA 2018 (exact). */
export const FARADAY_CONSTANT = 96485.33212;
/** 0 °C in kelvin. */
export const ZERO_CELSIUS_K = 273.15;

/** Kelvin from °C; throws at or below absolute zero. */
export function kelvin(tempC: number, name = "Temperature"): number {
  const t = requireFinite(tempC, name);
  const T = t + ZERO_CELSIUS_K;
  if (T <= 0) {
    throw new CalibrationInputError(
      "temperature-out-of-range",
      `${name} ${t} °C is at or below absolute zero`,
    );
  }
  return T;
}

/**
 * Ideal (Nernstian) slope of a pH electrode in mV per pH unit:
 * k(T) = ln(10)·R·T/F. k(25 °C) = 59.159 mV.
 */
export function nernstSlopeMv(tempC: number): number {
  return ((Math.LN10 * GAS_CONSTANT * kelvin(tempC)) / FARADAY_CONSTANT) * 1000;
}
