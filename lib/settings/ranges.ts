// Physical sanity ranges (DOMAIN.md section 4) in the units the settings store: a target band must lie inside.
import { PHYSICAL_RANGES } from "../alerts/ranges";

export const PHYSICAL_RANGE = {
  ph: [PHYSICAL_RANGES.ph.min, PHYSICAL_RANGES.ph.max],
  ecUs: [PHYSICAL_RANGES.ec.min * 1000, PHYSICAL_RANGES.ec.max * 1000],
  tempC: [PHYSICAL_RANGES.temp.min, PHYSICAL_RANGES.temp.max],
} as const satisfies Record<string, readonly [number, number]>;
