import { formatDuration, probeLabel } from "../format";
import type { Condition } from "../tracker";

/**
 * No reading for longer than `afterMs`. `null` when the probe has never reported
 * (pass the probe's install time as `lastAt` to alert on a probe that never reports).
 */
export function staleCondition(now: number, lastAt: number | null, afterMs: number): Condition | null {
  if (lastAt === null) return null;
  const stale = now - lastAt > afterMs;
  return { active: stale, clearOk: !stale };
}

export function staleFireMessage(m: Parameters<typeof probeLabel>[0], ageMs: number): string {
  return `${probeLabel(m)}: no data for ${formatDuration(ageMs)}`;
}

export function staleClearMessage(m: Parameters<typeof probeLabel>[0]): string {
  return `${probeLabel(m)} reporting again`;
}
