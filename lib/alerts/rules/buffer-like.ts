import { formatBand, formatValue, measureLabel } from "../format";
import { isValidBand, isWithin } from "../ranges";
import { conditionOf, type Condition } from "../tracker";
import type { Band } from "../types";

/**
 * The buffer value a pH reading sits at (within `tolerance`) when the tank's band
 * excludes that buffer — a probe probably left in a calibration buffer. `null`
 * otherwise, or without a valid band (a tank with no target cannot tell).
 */
export function nearExcludedBuffer(
  value: number,
  band: Band | null | undefined,
  buffers: readonly number[],
  tolerance: number,
): number | null {
  if (!isValidBand(band)) return null;
  for (const b of buffers) {
    if (Math.abs(value - b) <= tolerance && !isWithin(b, band)) return b;
  }
  return null;
}

export function bufferLikeCondition(buffer: number | null): Condition {
  return conditionOf(buffer !== null);
}

export function bufferLikeFireMessage(value: number, buffer: number, band: Band, sinceMs: number): string {
  const mins = Math.max(1, Math.round(sinceMs / 60_000));
  return `${measureLabel("ph")} ${formatValue("ph", value)} has sat at buffer ${buffer.toFixed(2)} for ${mins} min outside the band ${formatBand("ph", band)} — is the probe still in buffer?`;
}

export function bufferLikeClearMessage(value: number): string {
  return `${measureLabel("ph")} no longer at a buffer value (${formatValue("ph", value)})`;
}
