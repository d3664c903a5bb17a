import { describeCause } from "./describe";
import { makeEvent, type EventContext } from "./events";
import {
  calibrationClearMessages,
  dueSoonCondition,
  dueSoonFireMessage,
  lapsedCondition,
  lapsedFireMessage,
  probeReplaceCondition,
  probeReplaceFireMessage,
  rejectedCondition,
  rejectedFireMessage,
} from "./rules/calibration";
import {
  dosingInhibitClearMessage,
  dosingInhibitFireMessage,
  dosingInhibitOverrunCondition,
  dosingInhibitOverrunMs,
  holdOverrunClearMessage,
  holdOverrunCondition,
  holdOverrunFireMessage,
  holdOverrunMs,
  type DosingInhibitInfo,
  type HoldInfo,
} from "./rules/hold";
import { staleClearMessage, staleCondition, staleFireMessage } from "./rules/stale";
import { DEFAULT_RULE_SETTINGS, type RuleSettings } from "./settings";
import {
  restoreProbeState,
  restoreTankState,
  type CauseTracker,
  type ProbeAlertState,
  type TankAlertState,
} from "./state";
import { forceClear, stepTracker, type Condition } from "./tracker";
import type { AlertEvent, CalibrationStatus, Cause, Measure } from "./types";

export interface ProbeCalibrationInfo {
  status: CalibrationStatus;
  lastAcceptedAt: number | null;
  /** Optional: used only to word the due-soon message ("due in 3 d"). */
  dueAt?: number | null;
  lastRunRejected: boolean;
  consecutiveRejections: number;
  /** Optional: reasons of the last rejected run, quoted in the message. */
  lastRejectionReasons?: string[];
}

export interface TimeProbeInput {
  probeId: string;
  measure: Measure;
  state: ProbeAlertState | null | undefined;
  /** Last reading received for the probe (any quality); `null` if it never reported. */
  lastReadingAt: number | null;
  calibration: ProbeCalibrationInfo;
}

export interface EvaluateTimeInput {
  now: number;
  probes: TimeProbeInput[];
  tank: { hold: HoldInfo; dosingInhibit: DosingInhibitInfo };
  tankState: TankAlertState | null | undefined;
  settings?: RuleSettings;
}

export interface EvaluateTimeResult {
  probes: { probeId: string; measure: Measure; state: ProbeAlertState }[];
  tankState: TankAlertState;
  events: AlertEvent[];
}

const INSTANT = { fireDelayMs: 0, clearDelayMs: 0 };

interface Step<C extends Cause> {
  cause: C;
  cond: Condition | null;
  fire: () => string;
  clear: () => string;
}

function runSteps<K extends Cause, C extends K>(
  causes: Record<K, CauseTracker>,
  steps: Step<C>[],
  ctx: EventContext,
  allowFire: boolean,
  events: AlertEvent[],
): Record<K, CauseTracker> {
  const out = { ...causes };
  for (const s of steps) {
    const r = ctx.settings.causes[s.cause].enabled
      ? stepTracker(out[s.cause], s.cond, { at: ctx.at, ...INSTANT, allowFire })
      : forceClear(out[s.cause]);
    out[s.cause] = r.tracker;
    if (r.transition === "fire") events.push(makeEvent(ctx, "fire", s.cause, s.fire()));
    if (r.transition === "clear") {
      const msg = ctx.settings.causes[s.cause].enabled ? s.clear() : `${describeCause(s.cause)} rule disabled`;
      events.push(makeEvent(ctx, "clear", s.cause, msg));
    }
  }
  return out;
}

/**
 * Evaluates the time rules of one tank and its probes at `now` (the scheduler calls
 * it every 30 s): stale, calibration-due-soon, calibration-lapsed,
 * calibration-rejected, probe-replace per probe; hold-overrun and
 * dosing-inhibit-overrun per tank. Pure; inputs are not mutated.
 *
 * While the tank is on hold, probe causes do not fire (they may still clear, e.g.
 * an accepted calibration clears "calibration-lapsed"); a hold on single probes
 * (`tank.hold.probeIds`) silences only those probes; hold-overrun and
 * dosing-inhibit-overrun fire regardless. Each cause fires once and clears once:
 * calling again with the returned states yields no new events.
 */
export function evaluateTime(input: EvaluateTimeInput): EvaluateTimeResult {
  const settings = input.settings ?? DEFAULT_RULE_SETTINGS;
  const { now, tank } = input;
  const events: AlertEvent[] = [];
  // A hold on single probes silences only those probes; a tank hold silences them all.
  const probeHeld = (probeId: string) => tank.hold.active && (tank.hold.probeIds == null || tank.hold.probeIds.includes(probeId));

  const probes = input.probes.map((p) => {
    const prev = restoreProbeState(p.state);
    const cal = p.calibration;
    const m = p.measure;
    const lastAt =
      p.lastReadingAt === null && prev.lastTs === null
        ? null
        : Math.max(p.lastReadingAt ?? -Infinity, prev.lastTs ?? -Infinity);
    const ctx: EventContext = {
      measure: m,
      probeId: p.probeId,
      at: now,
      calibrationLapsed: cal.status === "lapsed" || cal.status === "never",
      settings,
    };
    const causes = runSteps(
      prev.causes,
      [
        {
          cause: "stale",
          cond: staleCondition(now, lastAt, settings.stale.afterMs),
          fire: () => staleFireMessage(m, now - (lastAt ?? now)),
          clear: () => staleClearMessage(m),
        },
        {
          cause: "calibration-due-soon",
          cond: dueSoonCondition(cal.status),
          fire: () => dueSoonFireMessage(m, now, cal.dueAt),
          clear: () => calibrationClearMessages["calibration-due-soon"](m),
        },
        {
          cause: "calibration-lapsed",
          cond: lapsedCondition(cal.status),
          fire: () => lapsedFireMessage(m, cal.status, now, cal.lastAcceptedAt),
          clear: () => calibrationClearMessages["calibration-lapsed"](m),
        },
        {
          cause: "calibration-rejected",
          cond: rejectedCondition(cal.lastRunRejected),
          fire: () => rejectedFireMessage(m, cal.lastRejectionReasons),
          clear: () => calibrationClearMessages["calibration-rejected"](m),
        },
        {
          cause: "probe-replace",
          cond: probeReplaceCondition(cal.consecutiveRejections, settings.calibration.probeReplaceAfterRejections),
          fire: () => probeReplaceFireMessage(m, cal.consecutiveRejections),
          clear: () => calibrationClearMessages["probe-replace"](m),
        },
      ],
      ctx,
      !probeHeld(p.probeId),
      events,
    );
    return { probeId: p.probeId, measure: m, state: { ...prev, causes } };
  });

  const prevTank = restoreTankState(input.tankState);
  const tankCtx: EventContext = { measure: null, at: now, calibrationLapsed: false, settings };
  const tankCauses = runSteps(
    prevTank.causes,
    [
      {
        cause: "hold-overrun",
        cond: holdOverrunCondition(now, tank.hold, settings.hold.overrunGraceMs),
        fire: () => holdOverrunFireMessage(holdOverrunMs(now, tank.hold) ?? 0),
        clear: () => holdOverrunClearMessage(tank.hold),
      },
      {
        cause: "dosing-inhibit-overrun",
        cond: dosingInhibitOverrunCondition(now, tank.dosingInhibit, tank.hold, settings.dosingInhibit.overrunGraceMs),
        fire: () =>
          dosingInhibitFireMessage(dosingInhibitOverrunMs(now, tank.dosingInhibit, tank.hold) ?? 0, tank.hold.active),
        clear: () => dosingInhibitClearMessage(tank.dosingInhibit.active),
      },
    ],
    tankCtx,
    true, // these fire even on hold: the hold itself is the problem
    events,
  );

  return { probes, tankState: { ...prevTank, causes: tankCauses }, events };
}
