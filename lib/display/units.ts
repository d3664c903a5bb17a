// EC display conversions (DOMAIN.md section 3, common practice). Storage is µS/cm.
import { ecToCf, ecToPpm } from "../calibration";

export type EcUnit = "mS/cm" | "µS/cm" | "ppm-500" | "ppm-700" | "CF";

export function ecInUnit(us: number, unit: EcUnit): number {
  const ms = us / 1000;
  switch (unit) {
    case "mS/cm":
      return ms;
    case "µS/cm":
      return us;
    case "ppm-500":
      return ecToPpm(ms, 500);
    case "ppm-700":
      return ecToPpm(ms, 700);
    case "CF":
      return ecToCf(ms);
  }
}

/** A value typed in the user's EC unit, in µS/cm: the inverse of ecInUnit. */
export function ecToMicrosiemens(value: number, unit: EcUnit): number {
  switch (unit) {
    case "mS/cm":
      return value * 1000;
    case "µS/cm":
      return value;
    case "ppm-500":
      return (value / 500) * 1000;
    case "ppm-700":
      return (value / 700) * 1000;
    case "CF":
      return (value / 10) * 1000;
  }
}

export function ecDecimals(unit: EcUnit): number {
  return unit === "mS/cm" ? 2 : unit === "CF" ? 1 : 0;
}

export function ecUnitLabel(unit: EcUnit): string {
  return unit === "ppm-500" ? "ppm (500)" : unit === "ppm-700" ? "ppm (700)" : unit;
}

export function formatEc(us: number | null | undefined, unit: EcUnit): string {
  if (us === null || us === undefined || !Number.isFinite(us)) return "—";
  return ecInUnit(us, unit).toFixed(ecDecimals(unit));
}
