import { formatBand, formatLimit, formatValue, measureLabel } from "../format";
import { isValidBand } from "../ranges";
import type { Condition } from "../tracker";
import type { Band, Measure } from "../types";

export interface OutOfBandCondition extends Condition {
  side: "above" | "below" | null;
}

/** Well inside the band (or no band): the usual answer, shared and never changed. */
const IN_BAND: Readonly<OutOfBandCondition> = Object.freeze({ active: false, clearOk: true, side: null });

/**
 * Outside [min, max] ⇒ active. Clearing needs the value back inside the band by
 * `hysteresisFraction` of the band width on both sides (fraction capped at 0.5).
 * No (valid) band configured ⇒ never active, and a firing alert may clear.
 */
export function outOfBandCondition(
  value: number,
  band: Band | null | undefined,
  hysteresisFraction: number,
): OutOfBandCondition {
  if (!isValidBand(band)) return IN_BAND;
  const side = value > band.max ? "above" : value < band.min ? "below" : null;
  const margin = Math.min(Math.max(hysteresisFraction, 0), 0.5) * (band.max - band.min);
  const clearOk = value >= band.min + margin && value <= band.max - margin;
  return side === null && clearOk ? IN_BAND : { active: side !== null, clearOk, side };
}

export function outOfBandFireMessage(m: Measure, value: number, band: Band, side: "above" | "below"): string {
  const limit = side === "above" ? band.max : band.min;
  return `${measureLabel(m)} ${formatValue(m, value)} ${side} ${formatLimit(m, limit)}`;
}

export function outOfBandClearMessage(m: Measure, value: number, band: Band | null | undefined): string {
  if (!isValidBand(band)) return `${measureLabel(m)} target band removed`;
  return `${measureLabel(m)} back in band at ${formatValue(m, value)} (${formatBand(m, band)})`;
}
