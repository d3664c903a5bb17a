import { PHYSICAL_RANGES } from "./ranges";
import type { Band, Cause, Measure, Severity } from "./types";

const SECOND = 1_000;
const MINUTE = 60 * SECOND;
const DAY = 24 * 60 * MINUTE;

export interface CauseSettings {
  enabled: boolean;
  severity: Severity;
}

/** All thresholds of the rule engine. Times in ms, values in pH / mS/cm / °C. */
export interface RuleSettings {
  causes: Record<Cause, CauseSettings>;
  outOfBand: {
    /** The value must stay outside the band this long before the alert fires. */
    fireDelayMs: number;
    /** Clearing needs the value inside the band by this fraction of the band width... */
    hysteresisFraction: number;
    /** ...continuously for this long. */
    clearDelayMs: number;
  };
  rateOfChange: {
    /** Largest acceptable change per minute, per measure (pH/min, mS/cm/min, °C/min). */
    maxPerMinute: Record<Measure, number>;
    /** Rate is measured between the reading and a sample at least this old (smooths noise). */
    windowMs: number;
    /** History is down-sampled to one sample per this interval (keeps the state small). */
    sampleIntervalMs: number;
    fireDelayMs: number;
    clearDelayMs: number;
  };
  stale: {
    /** No reading for longer than this ⇒ stale. */
    afterMs: number;
  };
  flatline: {
    /** Raw signal range (max − min) at or below this counts as flat; raw units: pH mV, EC µS, temp °C. */
    epsilonRaw: Record<Measure, number>;
    /** Flat for at least this long ⇒ flatline. */
    windowMs: Record<Measure, number>;
    /** And over at least this many readings (a sparse probe is "stale", not "flat"). */
    minSamples: number;
  };
  implausible: {
    ranges: Record<Measure, Band>;
    fireDelayMs: number;
    clearDelayMs: number;
  };
  bufferLike: {
    /** Nominal buffer pH values growers calibrate with. */
    buffers: number[];
    tolerance: number;
    fireDelayMs: number;
    clearDelayMs: number;
  };
  outOfSolution: {
    /** EC below this (mS/cm) looks like a probe in air / empty tank. */
    maxEc: number;
    fireDelayMs: number;
    clearDelayMs: number;
  };
  settling: {
    /** After a hold is released (or expires), reading rules stay silent this long. */
    afterReleaseMs: number;
  };
  calibration: {
    /** Window before the due date in which the status is "due-soon" (used by calibrationStatusAt). */
    dueSoonMs: number;
    /** Consecutive rejected calibration runs that mean "replace the probe". */
    probeReplaceAfterRejections: number;
  };
  hold: {
    /** hold-overrun fires once a hold is this far past its planned end. */
    overrunGraceMs: number;
  };
  dosingInhibit: {
    /** dosing-inhibit-overrun fires once dosing is inhibited this far past its planned end
     *  (or past the hold's release when the inhibit was not lifted with it). */
    overrunGraceMs: number;
  };
}

export type DeepPartial<T> = T extends readonly unknown[]
  ? T
  : T extends object
    ? { [K in keyof T]?: DeepPartial<T[K]> }
    : T;

/*
 * Every threshold below is a default of ours ("common practice"), not a published
 * value, except the physical ranges (DOMAIN.md §4) and "replace after two rejections
 * in a row" (DOMAIN.md §1, itself common practice). Growers/owners may override them.
 */
const DEFAULTS: RuleSettings = {
  causes: {
    "out-of-band": { enabled: true, severity: "critical" },
    "rate-of-change": { enabled: true, severity: "critical" },
    stale: { enabled: true, severity: "critical" },
    flatline: { enabled: true, severity: "warning" },
    implausible: { enabled: true, severity: "warning" },
    "calibration-due-soon": { enabled: true, severity: "warning" },
    "calibration-lapsed": { enabled: true, severity: "warning" },
    "calibration-rejected": { enabled: true, severity: "warning" },
    "probe-replace": { enabled: true, severity: "warning" },
    // A probe left in buffer or in air while the tank is live means the tank is
    // unwatched and dosing may act on a false reading.
    "buffer-like": { enabled: true, severity: "critical" },
    "out-of-solution": { enabled: true, severity: "critical" },
    "hold-overrun": { enabled: true, severity: "warning" },
    "dosing-inhibit-overrun": { enabled: true, severity: "critical" },
  },
  outOfBand: { fireDelayMs: 120 * SECOND, hysteresisFraction: 0.1, clearDelayMs: 60 * SECOND },
  rateOfChange: {
    maxPerMinute: { ph: 0.5, ec: 0.5, temp: 2 },
    windowMs: 60 * SECOND,
    sampleIntervalMs: 5 * SECOND,
    fireDelayMs: 10 * SECOND,
    clearDelayMs: 60 * SECOND,
  },
  stale: { afterMs: 120 * SECOND },
  flatline: {
    // 0.1 mV ≈ 0.002 pH; a live electrode in a stirred reservoir moves more than that.
    // Temperature sensors quantise (often 0.0625 °C) and a reservoir can hold one
    // temperature for a long time, so temp uses a longer window.
    epsilonRaw: { ph: 0.1, ec: 0.5, temp: 0.01 },
    windowMs: { ph: 15 * MINUTE, ec: 15 * MINUTE, temp: 60 * MINUTE },
    minSamples: 5,
  },
  implausible: {
    ranges: {
      ph: { ...PHYSICAL_RANGES.ph },
      ec: { ...PHYSICAL_RANGES.ec },
      temp: { ...PHYSICAL_RANGES.temp },
    },
    fireDelayMs: 0,
    clearDelayMs: 30 * SECOND,
  },
  bufferLike: {
    buffers: [4.0, 7.0, 10.0],
    tolerance: 0.05,
    fireDelayMs: 3 * MINUTE,
    clearDelayMs: 30 * SECOND,
  },
  outOfSolution: { maxEc: 0.05, fireDelayMs: 60 * SECOND, clearDelayMs: 30 * SECOND },
  settling: { afterReleaseMs: 10 * MINUTE },
  calibration: { dueSoonMs: 5 * DAY, probeReplaceAfterRejections: 2 },
  hold: { overrunGraceMs: 0 },
  dosingInhibit: { overrunGraceMs: 2 * MINUTE },
};

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function deepClone<T>(v: T): T {
  if (Array.isArray(v)) return v.map((x) => deepClone(x)) as T;
  if (isPlainObject(v)) {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) out[k] = deepClone(x);
    return out as T;
  }
  return v;
}

function deepFreeze<T>(v: T): T {
  if (typeof v === "object" && v !== null) {
    for (const x of Object.values(v)) deepFreeze(x);
    Object.freeze(v);
  }
  return v;
}

function deepMerge(base: unknown, patch: unknown): unknown {
  if (patch === undefined) return deepClone(base);
  if (isPlainObject(base) && isPlainObject(patch)) {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(base)) out[k] = deepMerge(base[k], patch[k]);
    // Unknown keys in the patch are ignored: settings have a fixed shape.
    return out;
  }
  // Arrays and scalars replace wholesale.
  return deepClone(patch);
}

/** The defaults, deeply frozen. Use `mergeSettings` to derive a modified copy. */
export const DEFAULT_RULE_SETTINGS: RuleSettings = deepFreeze(deepClone(DEFAULTS));

/**
 * Deep-merges `partial` over `base` (the defaults unless given). Arrays replace;
 * unknown keys are ignored; the result shares nothing with its inputs.
 */
export function mergeSettings(
  partial?: DeepPartial<RuleSettings> | null,
  base: RuleSettings = DEFAULT_RULE_SETTINGS,
): RuleSettings {
  return deepMerge(base, partial ?? undefined) as RuleSettings;
}
