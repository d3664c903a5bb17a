import { CalibrationInputError } from "./errors";
import { requireFinite } from "./guards";

export type PpmScale = 500 | 700;

/** ppm (TDS) from EC in mS/cm: × 500 or × 700 (common practice). */
export function ecToPpm(ecMsPerCm: number, scale: PpmScale): number {
  const ec = requireFinite(ecMsPerCm, "EC");
  if (scale !== 500 && scale !== 700) {
    throw new CalibrationInputError(
      "invalid-parameter",
      `The ppm scale must be 500 or 700, got ${String(scale)}`,
    );
  }
  return ec * scale;
}

/** CF from EC in mS/cm: × 10 (common practice). */
export function ecToCf(ecMsPerCm: number): number {
  return requireFinite(ecMsPerCm, "EC") * 10;
}
