import type { RuleSettings } from "./settings";
import type { AlertEvent, Cause, Measure } from "./types";

export interface EventContext {
  measure: Measure | null;
  probeId?: string;
  at: number;
  calibrationLapsed: boolean;
  settings: RuleSettings;
}

export function makeEvent(
  ctx: EventContext,
  type: AlertEvent["type"],
  cause: Cause,
  message: string,
  value?: number | null,
): AlertEvent {
  const ev: AlertEvent = {
    type,
    cause,
    measure: ctx.measure,
    at: ctx.at,
    message,
    calibrationLapsed: ctx.calibrationLapsed,
    severity: ctx.settings.causes[cause].severity,
  };
  if (ctx.probeId !== undefined) ev.probeId = ctx.probeId;
  if (value !== undefined && value !== null && Number.isFinite(value)) ev.value = value;
  return ev;
}
