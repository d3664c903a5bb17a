// Faults the simulator can show on demand, per tank and probe (pure state, no I/O):
//   stuck            the probe's signal freezes at its last value (flatline)
//   out-of-solution  the probe hangs in air: pH mV wanders, conductance ~0, temperature = air
//   spike            one sample far off, then back to normal (clears itself)
//   fast-drift       the signal runs away steadily (rate-of-change)
//   offline          the controller stops publishing and disconnects (stale)
//   out-of-band      the solution itself leaves the target band and the dosing cannot fix it
//   none             clears the faults (of one measure, or all)
import type { SimFault } from "../../ingest/payloads";

export type Measure = "ph" | "ec" | "temp";
export const MEASURES: readonly Measure[] = ["ph", "ec", "temp"];

export interface ProbeFault {
  cause: Exclude<SimFault, "none" | "offline">;
  since: number; // ms epoch
  /** For stuck: the frozen signal, captured at the first sample after the fault began. */
  frozen?: number;
}

export interface FaultState {
  offline: boolean;
  probe: Record<Measure, ProbeFault | null>;
}

export const noFaults = (): FaultState => ({ offline: false, probe: { ph: null, ec: null, temp: null } });

/** Which probes a cause touches when no measure is given. */
function defaultMeasures(cause: SimFault): readonly Measure[] {
  switch (cause) {
    case "stuck":
    case "out-of-solution":
    case "none":
      return MEASURES;
    default:
      return ["ph"];
  }
}

export function applyFault(state: FaultState, cause: SimFault, measure: Measure | undefined, now: number): FaultState {
  const next: FaultState = { offline: state.offline, probe: { ...state.probe } };
  if (cause === "offline") {
    next.offline = true;
    return next;
  }
  const measures = measure ? [measure] : defaultMeasures(cause);
  if (cause === "none") {
    if (!measure) next.offline = false;
    for (const m of measures) next.probe[m] = null;
    return next;
  }
  for (const m of measures) next.probe[m] = { cause, since: now };
  return next;
}
