// EC typed in the user's display unit, stored in µS/cm (DOMAIN.md section 3 conversions, common
// practice): the inverse of lib/display/units.ts ecInUnit.
import type { EcUnit } from "../display/units";

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
