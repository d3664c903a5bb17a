import type { Band, Measure } from "./types";

/**
 * Physical sanity ranges (DOMAIN.md §4): a reading outside is "implausible"
 * (a probe, wiring or correction fault), never "out of band". Bounds inclusive.
 */
export const PHYSICAL_RANGES: Readonly<Record<Measure, Readonly<Band>>> = Object.freeze({
  ph: Object.freeze({ min: 0, max: 14 }),
  ec: Object.freeze({ min: 0, max: 20 }), // mS/cm
  temp: Object.freeze({ min: -5, max: 60 }), // °C
});

export function isWithin(value: number, band: Band): boolean {
  return value >= band.min && value <= band.max;
}

export function isValidBand(band: Band | null | undefined): band is Band {
  return (
    band != null &&
    Number.isFinite(band.min) &&
    Number.isFinite(band.max) &&
    band.min <= band.max
  );
}
