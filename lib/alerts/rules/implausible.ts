import { formatBand, formatValue, measureLabel } from "../format";
import { isWithin } from "../ranges";
import { ACTIVE, conditionOf, type Condition } from "../tracker";
import type { Band, Measure, ReadingQuality } from "../types";

/**
 * Implausible = outside the physical range of the measure, or flagged "suspect" by
 * ingest (DOMAIN.md §4: readings outside the physical ranges are "suspect"). `null`
 * when there is nothing to judge (no corrected value and not flagged).
 */
export function implausibleCondition(
  value: number | null,
  quality: ReadingQuality,
  range: Band,
): Condition | null {
  if (quality === "suspect") return ACTIVE;
  if (value === null) return null;
  const bad = !isWithin(value, range);
  return conditionOf(bad);
}

export function implausibleFireMessage(m: Measure, value: number | null, range: Band): string {
  if (value === null || isWithin(value, range)) {
    return `${measureLabel(m)} reading flagged suspect${value === null ? "" : ` (${formatValue(m, value)})`} — check the probe and its wiring`;
  }
  return `${measureLabel(m)} ${formatValue(m, value)} outside the physical range ${formatBand(m, range)} — check the probe and its wiring`;
}

export function implausibleClearMessage(m: Measure, value: number | null): string {
  return `${measureLabel(m)} readings plausible again${value === null ? "" : ` (${formatValue(m, value)})`}`;
}
