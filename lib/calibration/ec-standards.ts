import { CalibrationInputError } from "./errors";
import { fmtTemp } from "./format";
import { requireFinite } from "./guards";
import { interpolateTable, type TemperatureTable } from "./interpolate";

/**
 * EC standards Tidewell knows by id. Note the case: "m" is mol/kg (molal),
 * "M" is mol/L (molar).
 */
export type EcStandardId = "kcl-0.01m" | "kcl-0.1m" | "kcl-0.01M";

/** A standard known by its EC at 25 °C and a linear temperature coefficient. */
export interface CustomEcStandard {
  ec25UsPerCm: number;
  alphaPerC: number;
}

export type EcStandardSpec = EcStandardId | CustomEcStandard;

/**
 * 0.01 mol/kg KCl, µS/cm. NIST, Wu, Koch and Pratt, J. Res. NIST 96 (1991) 191,
 * as tabulated in the CRC Handbook ("Standard KCl solutions for calibrating
 * conductivity cells").
 */
const KCL_001_MOLAL: TemperatureTable = [
  [0, 772.92],
  [5, 890.96],
  [10, 1013.95],
  [15, 1141.45],
  [18, 1219.93],
  [20, 1273.03],
  [25, 1408.23],
  [30, 1546.63],
  [35, 1687.79],
  [40, 1831.27],
];

/** 0.1 mol/kg KCl at 25 °C, µS/cm (NIST, Wu, Koch and Pratt 1991 / CRC Handbook). */
export const KCL_01_MOLAL_EC25 = 12824.6;
/** Linear temperature coefficient used for 0.1 mol/kg KCl away from 25 °C (common practice). */
export const KCL_01_MOLAL_ALPHA = 0.0191;

/**
 * 0.01 mol/L KCl, µS/cm: 1413 at 25 °C (OIML R 56; also ASTM D1125); the other
 * rows as commonly printed on standards (common practice).
 */
const KCL_001_MOLAR: TemperatureTable = [
  [15, 1147],
  [20, 1278],
  [25, 1413],
  [30, 1552],
];

/**
 * Temperatures over which a linear-compensation standard (kcl-0.1m, custom) is
 * used: the range of the NIST table (Tidewell choice).
 */
export const LINEAR_STANDARD_RANGE_C = [0, 40] as const;

/** Largest temperature coefficient accepted, per °C (Tidewell sanity bound). */
export const MAX_ALPHA_PER_C = 0.1;

export const EC_STANDARD_IDS: readonly EcStandardId[] = ["kcl-0.01m", "kcl-0.1m", "kcl-0.01M"];

/** Throws unless alpha is a plausible linear temperature coefficient. */
export function requireAlpha(value: unknown, name: string): number {
  const a = requireFinite(value, name);
  if (a < 0 || a > MAX_ALPHA_PER_C) {
    throw new CalibrationInputError(
      "invalid-parameter",
      `${name} must be between 0 and ${MAX_ALPHA_PER_C} per °C (about 0.019 for nutrient solutions), got ${a}`,
    );
  }
  return a;
}

function linearStandard(ec25: number, alpha: number, tempC: number, what: string): number {
  const [lo, hi] = LINEAR_STANDARD_RANGE_C;
  if (tempC < lo || tempC > hi) {
    throw new CalibrationInputError(
      "temperature-out-of-range",
      `${what} is used only from ${fmtTemp(lo)} to ${fmtTemp(hi)}; ${fmtTemp(tempC)} is outside that range`,
    );
  }
  return ec25 * (1 + alpha * (tempC - 25));
}

/** Conductivity of a standard at a temperature, µS/cm. */
export function ecStandardAt(standard: EcStandardSpec, tempC: number): number {
  const t = requireFinite(tempC, "Standard temperature");
  if (typeof standard === "object" && standard !== null) {
    const ec25 = requireFinite(standard.ec25UsPerCm, "The standard's EC at 25 °C");
    if (ec25 <= 0) {
      throw new CalibrationInputError(
        "invalid-parameter",
        `The standard's EC at 25 °C must be greater than zero, got ${ec25} µS/cm`,
      );
    }
    const alpha = requireAlpha(standard.alphaPerC, "The standard's temperature coefficient");
    return linearStandard(ec25, alpha, t, "The custom standard");
  }
  switch (standard) {
    case "kcl-0.01m":
      return interpolateTable(KCL_001_MOLAL, t, "The EC of standard kcl-0.01m");
    case "kcl-0.01M":
      return interpolateTable(KCL_001_MOLAR, t, "The EC of standard kcl-0.01M");
    case "kcl-0.1m":
      return linearStandard(KCL_01_MOLAL_EC25, KCL_01_MOLAL_ALPHA, t, "Standard kcl-0.1m");
    default:
      throw new CalibrationInputError(
        "unknown-standard",
        `Unknown EC standard "${String(standard)}"; choose one of ${EC_STANDARD_IDS.join(", ")} or enter the standard's EC at 25 °C and its temperature coefficient`,
      );
  }
}
