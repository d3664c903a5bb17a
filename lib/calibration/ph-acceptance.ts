import { fmtAgainst } from "./format";

export type Verdict = "accepted" | "rejected";

/**
 * Acceptance of a pH calibration (common practice, no single published source;
 * widely used by electrode makers).
 */
export const PH_ACCEPTANCE = {
  minSlopePct: 90,
  /** Below this (and at or above the minimum) the fit is accepted with advice. */
  adviseBelowSlopePct: 95,
  maxSlopePct: 105,
  maxAbsOffsetMv: 30,
} as const;

/**
 * Slack for comparisons at the limits, so a fit that is exactly on a limit in
 * decimal (e.g. 90 %) is not lost to binary rounding (89.99999999999).
 */
const EPS = 1e-9;

export interface PhJudgement {
  verdict: Verdict;
  reasons: string[];
  advice: string[];
}

/** Applies the acceptance rules to a slope (% of Nernstian) and offset (mV). */
export function judgePhCalibration(slopePct: number, offsetMv: number): PhJudgement {
  const { minSlopePct, adviseBelowSlopePct, maxSlopePct, maxAbsOffsetMv } = PH_ACCEPTANCE;
  const reasons: string[] = [];
  const advice: string[] = [];

  if (slopePct < minSlopePct - EPS) {
    const s = fmtAgainst(slopePct, minSlopePct);
    if (slopePct <= 0) {
      reasons.push(
        `Slope ${s} % is below the ${minSlopePct} % minimum: the reading did not rise and fall with the buffers as it should; check each point was entered with the buffer it was measured in, check the probe is connected, and retry`,
      );
    } else if (slopePct < 50) {
      reasons.push(
        `Slope ${s} % is below the ${minSlopePct} % minimum: the probe barely responds; check it is connected and not dry or cracked, clean it and retry, or replace it`,
      );
    } else {
      reasons.push(
        `Slope ${s} % is below the ${minSlopePct} % minimum: clean the probe and retry`,
      );
    }
  } else if (slopePct > maxSlopePct + EPS) {
    reasons.push(
      `Slope ${fmtAgainst(slopePct, maxSlopePct)} % is above the ${maxSlopePct} % maximum: use fresh buffers, check the buffer and temperature entered for each point, and retry`,
    );
  } else if (slopePct < adviseBelowSlopePct - EPS) {
    advice.push(
      `Slope ${fmtAgainst(slopePct, adviseBelowSlopePct)} % is between ${minSlopePct} % and ${adviseBelowSlopePct} %: clean the probe soon`,
    );
  }

  if (Math.abs(offsetMv) > maxAbsOffsetMv + EPS) {
    const o = fmtAgainst(Math.abs(offsetMv), maxAbsOffsetMv);
    reasons.push(
      `Offset ${offsetMv < 0 ? "-" : ""}${o} mV is outside the ±${maxAbsOffsetMv} mV limit: clean the probe, soak it in storage solution for an hour and retry`,
    );
  }

  if (reasons.length > 0) {
    advice.push(
      "After a rejection, clean the probe, inspect it for cracks and retry once; a probe rejected twice in a row is due for replacement",
    );
  }

  return { verdict: reasons.length === 0 ? "accepted" : "rejected", reasons, advice };
}
