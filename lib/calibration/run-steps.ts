/**
 * The steps of a guided calibration run, derived from what has been recorded so
 * far, so a run resumed in a new browser lands on the right step. Pure.
 */

export type RunStepKey = "as-found" | "clean" | "point" | "result";

export interface RunStep {
  key: RunStepKey;
  /** For "point" steps: 0-based index into the planned standards. */
  index?: number;
  /** For "as-found" and "point" steps: the buffer or standard used (id or JSON table). */
  standard?: string;
  done: boolean;
}

export interface RunProgressInput {
  plannedStandards: readonly string[];
  /** An as-found check needs a calibration to check; a never-calibrated probe skips it. */
  hasPreviousCalibration: boolean;
  asFoundTaken: boolean;
  asFoundSkipped: boolean;
  cleaned: boolean;
  /** Calibration points captured so far (purpose "point"). */
  pointsTaken: number;
}

export interface RunProgress {
  steps: RunStep[];
  /** Index into `steps` of the first step not done (the result step when all are). */
  current: number;
}

/**
 * As-found check (in the first buffer, before adjusting), clean and rinse, then
 * each planned buffer or standard in order (neutral first by default), then the
 * result.
 */
export function runProgress(input: RunProgressInput): RunProgress {
  const steps: RunStep[] = [];
  if (input.hasPreviousCalibration && input.plannedStandards.length > 0) {
    steps.push({ key: "as-found", standard: input.plannedStandards[0], done: input.asFoundTaken || input.asFoundSkipped });
  }
  steps.push({ key: "clean", done: input.cleaned });
  input.plannedStandards.forEach((standard, index) => {
    steps.push({ key: "point", index, standard, done: index < input.pointsTaken });
  });
  steps.push({ key: "result", done: false });
  const current = steps.findIndex((s) => !s.done);
  return { steps, current };
}
