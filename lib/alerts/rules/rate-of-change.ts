import { formatValue, measureLabel, trimNumber, unitSuffix } from "../format";
import type { RateSample } from "../state";
import { conditionOf, type Condition } from "../tracker";
import type { Measure } from "../types";

/**
 * Change per minute between `value` at `ts` and the newest history sample at
 * least `windowMs` older. Measuring over a window (not reading to reading) keeps
 * sensor noise at 1 Hz from looking like a fast change. `null` until there is
 * enough history.
 */
export function ratePerMinute(
  history: readonly RateSample[],
  ts: number,
  value: number,
  windowMs: number,
): number | null {
  for (let i = history.length - 1; i >= 0; i--) {
    const s = history[i];
    const dt = ts - s.ts;
    if (dt >= windowMs && dt > 0) return ((value - s.value) / dt) * 60_000;
  }
  return null;
}

/**
 * Appends the sample (down-sampled to one per `sampleIntervalMs`) and drops
 * samples older than the newest one that is already `windowMs` old, which stays
 * as the reference for the next reading. Returns a new array.
 */
export function updateHistory(
  history: readonly RateSample[],
  sample: RateSample,
  windowMs: number,
  sampleIntervalMs: number,
): RateSample[] {
  // The usual case at any real rate: a newer reading within the sampling interval of the last
  // sample, with no newer sample yet `windowMs` old. Nothing would change: the history is
  // returned as it is (it is never mutated) instead of copied for every reading.
  const newest = history[history.length - 1];
  if (newest && newest.ts < sample.ts && sample.ts - newest.ts < sampleIntervalMs && (history.length < 2 || sample.ts - history[1].ts < windowMs)) {
    return history as RateSample[];
  }
  const out = history.filter((s) => s.ts < sample.ts);
  const last = out[out.length - 1];
  if (!last || sample.ts - last.ts >= sampleIntervalMs) out.push({ ...sample });
  let ref = -1;
  for (let i = out.length - 1; i >= 0; i--) {
    if (sample.ts - out[i].ts >= windowMs) {
      ref = i;
      break;
    }
  }
  return ref > 0 ? out.slice(ref) : out;
}

export function rateCondition(rate: number | null, maxPerMinute: number): Condition | null {
  if (rate === null) return null;
  return conditionOf(Math.abs(rate) > maxPerMinute);
}

function perMinute(m: Measure, v: number): string {
  return `${trimNumber(v, 2)}${unitSuffix(m)} per min`;
}

export function rateFireMessage(m: Measure, value: number, rate: number, max: number): string {
  const dir = rate > 0 ? "rising" : "falling";
  return `${measureLabel(m)} ${dir} ${perMinute(m, Math.abs(rate))} (limit ${perMinute(m, max)}), now ${formatValue(m, value)}`;
}

export function rateClearMessage(m: Measure, value: number, max: number): string {
  return `${measureLabel(m)} changing slower than ${perMinute(m, max)} again, now ${formatValue(m, value)}`;
}
