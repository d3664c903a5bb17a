import { describe, it, expect } from "vitest";
import {
  CAUSES,
  DEFAULT_RULE_SETTINGS,
  PHYSICAL_RANGES,
  calibrationStatusAt,
  describeCause,
  evaluateReading,
  evaluateTime,
  firingCauses,
  initialProbeState,
  initialTankState,
  isFiring,
  mergeSettings,
  restoreProbeState,
  type AlertEvent,
  type Band,
  type CalibrationStatus,
  type Cause,
  type EvaluateTimeInput,
  type Measure,
  type ProbeAlertState,
  type ProbeCalibrationInfo,
  type ReadingQuality,
  type RuleSettings,
  type TankAlertState,
} from "@/lib/alerts";
import { ACTIVE, CLEAR, advanceTracker, stepTracker } from "@/lib/alerts/tracker";

// ---------------------------------------------------------------------------------------
// Fixtures. Times in the tables are seconds after T0 (3 a.m.), converted to ms epoch.
// ---------------------------------------------------------------------------------------
const T0 = Date.UTC(2025, 0, 15, 3, 0, 0);
const SEC = 1_000;
const MIN = 60 * SEC;
const DAY = 24 * 60 * MIN;

// Lettuce bands: DOMAIN.md §4 (common practice, from memory; growers edit them).
// Solution temperature 18–22 °C: DOMAIN.md §4 (common practice).
const BANDS: Record<Measure, Band> = {
  ph: { min: 5.5, max: 6.5 },
  ec: { min: 0.8, max: 1.2 },
  temp: { min: 18, max: 22 },
};

interface Step {
  s: number; // seconds after T0
  v: number | null;
  raw?: number;
  q?: ReadingQuality;
  hold?: { active: boolean; releasedAt?: number | null };
}

interface RunOpts {
  state?: ProbeAlertState;
  band?: Partial<Record<Measure, Band | null>>;
  hold?: { active: boolean; releasedAt?: number | null };
  cal?: CalibrationStatus;
  settings?: RuleSettings;
  roundTrip?: boolean; // persist/restore the state as JSON between readings (restart)
}

/** Readings every `step` s from `from` to `to` inclusive. Raw alternates 0/1 so nothing looks flat. */
function every(
  from: number,
  to: number,
  step: number,
  v: number | null | ((s: number) => number),
  extra: Partial<Step> = {},
): Step[] {
  const out: Step[] = [];
  for (let s = from; s <= to + 1e-9; s += step) out.push({ s, v: typeof v === "function" ? v(s) : v, ...extra });
  return out;
}

function run(measure: Measure, steps: Step[], o: RunOpts = {}) {
  let state: ProbeAlertState = o.state ?? initialProbeState();
  const events: AlertEvent[] = [];
  steps.forEach((st, i) => {
    const r = evaluateReading({
      state,
      reading: { ts: T0 + st.s * SEC, value: st.v, raw: st.raw ?? i % 2, measure, quality: st.q ?? "ok" },
      tank: { band: o.band ?? BANDS, hold: st.hold ?? o.hold ?? { active: false } },
      calibration: { status: o.cal ?? "current" },
      settings: o.settings,
    });
    state = o.roundTrip ? (JSON.parse(JSON.stringify(r.state)) as ProbeAlertState) : r.state;
    events.push(...r.events);
  });
  return { state, events };
}

const sec = (e: AlertEvent) => (e.at - T0) / SEC;
const brief = (evs: AlertEvent[], cause?: Cause) =>
  evs.filter((e) => !cause || e.cause === cause).map((e) => `${e.type} ${e.cause} @${sec(e)}`);

// ---------------------------------------------------------------------------------------
describe("settings", () => {
  it("has the documented defaults (all ours, common practice)", () => {
    const d = DEFAULT_RULE_SETTINGS;
    expect(d.outOfBand).toEqual({ fireDelayMs: 120 * SEC, hysteresisFraction: 0.1, clearDelayMs: 60 * SEC }); // common practice
    expect(d.rateOfChange.maxPerMinute).toEqual({ ph: 0.5, ec: 0.5, temp: 2 }); // common practice
    expect(d.stale.afterMs).toBe(120 * SEC); // common practice
    expect(d.flatline.windowMs.ph).toBe(15 * MIN); // common practice
    expect(d.settling.afterReleaseMs).toBe(10 * MIN); // common practice
    expect(d.calibration.dueSoonMs).toBe(5 * DAY); // common practice
    expect(d.calibration.probeReplaceAfterRejections).toBe(2); // DOMAIN.md §1 (common practice)
    expect(d.bufferLike.tolerance).toBe(0.05); // common practice
    expect(d.outOfSolution.maxEc).toBe(0.05); // common practice
    // DOMAIN.md §4 physical sanity ranges
    expect(d.implausible.ranges).toEqual({ ph: { min: 0, max: 14 }, ec: { min: 0, max: 20 }, temp: { min: -5, max: 60 } });
    expect(PHYSICAL_RANGES.ph).toEqual({ min: 0, max: 14 });
    for (const c of CAUSES) expect(d.causes[c].enabled).toBe(true);
  });

  it("mergeSettings deep-merges without touching the defaults", () => {
    const s = mergeSettings({
      outOfBand: { fireDelayMs: 30 * SEC },
      rateOfChange: { maxPerMinute: { ph: 0.2 } },
      bufferLike: { buffers: [6.86] },
      causes: { flatline: { enabled: false } },
    });
    expect(s.outOfBand).toEqual({ fireDelayMs: 30 * SEC, hysteresisFraction: 0.1, clearDelayMs: 60 * SEC });
    expect(s.rateOfChange.maxPerMinute).toEqual({ ph: 0.2, ec: 0.5, temp: 2 });
    expect(s.bufferLike.buffers).toEqual([6.86]); // arrays replace
    expect(s.causes.flatline).toEqual({ enabled: false, severity: "warning" });
    expect(DEFAULT_RULE_SETTINGS.outOfBand.fireDelayMs).toBe(120 * SEC);
    expect(DEFAULT_RULE_SETTINGS.bufferLike.buffers).toEqual([4, 7, 10]);
    expect(Object.isFrozen(DEFAULT_RULE_SETTINGS.outOfBand)).toBe(true);
    s.outOfBand.fireDelayMs = 1; // the copy is mutable and independent
    expect(mergeSettings().outOfBand.fireDelayMs).toBe(120 * SEC);
  });
});

// ---------------------------------------------------------------------------------------
describe("out of band", () => {
  it.each([
    { measure: "ph" as const, v: 6.8, msg: "pH 6.80 above 6.5" },
    { measure: "ph" as const, v: 5.2, msg: "pH 5.20 below 5.5" },
    { measure: "ec" as const, v: 1.5, msg: "EC 1.50 mS/cm above 1.2 mS/cm" },
    { measure: "ec" as const, v: 0.6, msg: "EC 0.60 mS/cm below 0.8 mS/cm" },
    { measure: "temp" as const, v: 24.3, msg: "Temperature 24.3 °C above 22 °C" },
    { measure: "temp" as const, v: 16, msg: "Temperature 16.0 °C below 18 °C" },
  ])("$measure $v fires after the 120 s delay (common practice), not before", ({ measure, v, msg }) => {
    const before = run(measure, every(0, 110, 10, v));
    expect(before.events).toEqual([]);
    const { events } = run(measure, every(0, 600, 10, v));
    expect(brief(events)).toEqual(["fire out-of-band @120"]);
    expect(events[0]).toMatchObject({ type: "fire", measure, value: v, message: msg, calibrationLapsed: false, severity: "critical" });
  });

  it("an excursion interrupted by an in-band reading restarts the delay", () => {
    const steps = [...every(0, 100, 10, 6.8), { s: 110, v: 6.4 }, ...every(120, 400, 10, 6.8)];
    expect(brief(run("ph", steps).events)).toEqual(["fire out-of-band @240"]);
  });

  it("clears only inside the hysteresis margin (0.1 of band width, common practice) after 60 s", () => {
    // Band 5.5–6.5, width 1 ⇒ clear zone 5.6–6.4.
    const steps = [
      ...every(0, 200, 10, 6.8), // fires at 120
      ...every(210, 800, 10, 6.45), // back in band but inside the margin: stays firing
      ...every(810, 840, 10, 6.35), // in the clear zone for 30 s...
      { s: 850, v: 6.45 }, // ...drifts into the margin: clear timer restarts
      ...every(860, 1000, 10, 6.3), // clears 60 s after 860
    ];
    const { events, state } = run("ph", steps);
    expect(brief(events)).toEqual(["fire out-of-band @120", "clear out-of-band @920"]);
    expect(events[1].message).toBe("pH back in band at 6.30 (5.5–6.5)");
    expect(isFiring(state, "out-of-band")).toBe(false);
  });

  it("no band configured for the measure ⇒ no out-of-band", () => {
    expect(run("ph", every(0, 600, 10, 6.8), { band: { ph: null } }).events).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------
describe("calibration-aware reading alerts", () => {
  it.each([
    { status: "lapsed" as const, q: "ok" as const, lapsed: true, msg: "pH 7.42 above 6.5 — calibration lapsed, reading may be off" },
    { status: "never" as const, q: "uncalibrated" as const, lapsed: true, msg: "pH 7.42 above 6.5 — probe never calibrated, reading may be off" },
    { status: "current" as const, q: "lapsed" as const, lapsed: true, msg: "pH 7.42 above 6.5 — calibration lapsed, reading may be off" },
    { status: "due-soon" as const, q: "ok" as const, lapsed: false, msg: "pH 7.42 above 6.5" },
    { status: "current" as const, q: "ok" as const, lapsed: false, msg: "pH 7.42 above 6.5" },
  ])("calibration $status / quality $q ⇒ calibrationLapsed $lapsed", ({ status, q, lapsed, msg }) => {
    const { events } = run("ph", every(0, 200, 10, 7.42, { q }), { cal: status });
    expect(events).toHaveLength(1);
    expect(events[0].message).toBe(msg);
    expect(events[0].calibrationLapsed).toBe(lapsed);
  });
});

// ---------------------------------------------------------------------------------------
describe("implausible vs out of band", () => {
  it.each([
    { measure: "ph" as const, v: 15.2, msg: "pH 15.20 outside the physical range 0–14 — check the probe and its wiring" },
    { measure: "ph" as const, v: -0.3, msg: "pH -0.30 outside the physical range 0–14 — check the probe and its wiring" },
    { measure: "ec" as const, v: 25, msg: "EC 25.00 mS/cm outside the physical range 0–20 mS/cm — check the probe and its wiring" },
    { measure: "temp" as const, v: -10, msg: "Temperature -10.0 °C outside the physical range -5 to 60 °C — check the probe and its wiring" },
    { measure: "temp" as const, v: 85, msg: "Temperature 85.0 °C outside the physical range -5 to 60 °C — check the probe and its wiring" },
  ])("$measure $v (DOMAIN.md §4 range) is implausible at once, never out of band", ({ measure, v, msg }) => {
    const { events } = run(measure, every(0, 900, 10, v));
    expect(brief(events)).toEqual(["fire implausible @0"]);
    expect(events[0]).toMatchObject({ message: msg, severity: "warning" });
  });

  it("the range bounds themselves are plausible (pH 14 is out of band, not implausible)", () => {
    expect(brief(run("ph", every(0, 200, 10, 14)).events)).toEqual(["fire out-of-band @120"]);
    expect(brief(run("ec", every(0, 200, 10, 20)).events)).toEqual(["fire out-of-band @120"]);
  });

  it("a reading flagged suspect by ingest is implausible", () => {
    const { events } = run("ph", every(0, 60, 10, 6.0, { q: "suspect" }));
    expect(brief(events)).toEqual(["fire implausible @0"]);
    expect(events[0].message).toBe("pH reading flagged suspect (6.00) — check the probe and its wiring");
  });

  it("clears after 30 s of plausible readings", () => {
    const steps = [...every(0, 50, 10, 15.2), ...every(60, 80, 10, 6.0), { s: 85, v: 15.1 }, ...every(90, 200, 10, 6.0)];
    const { events } = run("ph", steps);
    expect(brief(events)).toEqual(["fire implausible @0", "clear implausible @120"]);
    expect(events[1].message).toBe("pH readings plausible again (6.00)");
  });

  it("implausible readings do not feed the band rule", () => {
    // Out of band for 100 s, then implausible for 10 min: the band alert never fires on them.
    const steps = [...every(0, 100, 10, 6.8), ...every(110, 700, 10, 99)];
    expect(brief(run("ph", steps).events, "out-of-band")).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------
describe("rate of change", () => {
  // Limits (common practice): pH 0.5/min, EC 0.5 mS/cm/min, temp 2 °C/min; measured over 60 s.
  it.each([
    { measure: "ph" as const, start: 6.0, perMin: 1.0, fires: true },
    { measure: "ph" as const, start: 6.0, perMin: -1.2, fires: true },
    { measure: "ph" as const, start: 6.0, perMin: 0.3, fires: false },
    { measure: "ec" as const, start: 1.0, perMin: 0.8, fires: true },
    { measure: "ec" as const, start: 1.0, perMin: 0.2, fires: false },
    { measure: "temp" as const, start: 20, perMin: 3, fires: true },
    { measure: "temp" as const, start: 20, perMin: 1, fires: false },
  ])("$measure ramp $perMin per min ⇒ fires: $fires", ({ measure, start, perMin, fires }) => {
    // Ramp for 2 min, then hold steady for 5 min; a reading every 5 s.
    const v = (s: number) => start + (perMin * Math.min(s, 120)) / 60;
    const { events } = run(measure, every(0, 420, 5, v), { band: {} });
    const rate = events.filter((e) => e.cause === "rate-of-change");
    if (!fires) {
      expect(rate).toEqual([]);
      return;
    }
    expect(rate.map((e) => e.type)).toEqual(["fire", "clear"]);
    // First rate is known at 60 s, plus the 10 s fire delay (common practice).
    expect(sec(rate[0])).toBe(70);
    expect(rate[0].message).toContain(perMin > 0 ? "rising" : "falling");
    // Clears 60 s after the 60 s-window rate drops back under the limit.
    expect(sec(rate[1])).toBeGreaterThan(120 + 60);
  });

  it("message wording", () => {
    const { events } = run("ph", every(0, 80, 5, (s) => 6 + s / 60), { band: {} });
    expect(events[0].message).toBe("pH rising 1 per min (limit 0.5 per min), now 7.17");
  });

  it("a single spike does not fire (noise filtered by the window and the 10 s fire delay)", () => {
    const steps = [...every(0, 195, 5, 6.0), { s: 200, v: 7.5 }, ...every(205, 400, 5, 6.0)];
    expect(run("ph", steps).events).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------
describe("flatline", () => {
  it("a raw signal stuck within epsilon for 15 min (common practice) fires, then clears when it moves", () => {
    const stuck = every(0, 1200, 30, 6.0).map((st, i) => ({ ...st, raw: -17.3 + (i % 2) * 0.05 })); // within 0.1 mV
    const moving = every(1230, 1300, 30, 6.0).map((st, i) => ({ ...st, raw: -16 + i }));
    const { events } = run("ph", [...stuck, ...moving]);
    expect(brief(events)).toEqual(["fire flatline @900", "clear flatline @1230"]);
    expect(events[0].message).toBe("pH probe signal unchanged for 15 min — probe may be stuck or disconnected");
    expect(events[1].message).toBe("pH probe signal moving again");
  });

  it("a live signal (noise above epsilon) does not fire", () => {
    const steps = every(0, 3600, 30, 6.0).map((st, i) => ({ ...st, raw: -17.3 + (i % 3) * 0.2 }));
    expect(run("ph", steps).events).toEqual([]);
  });

  it("temperature uses a 60 min window (sensors quantise; common practice)", () => {
    const steps = every(0, 3600, 60, 20.0).map((st) => ({ ...st, raw: 20.0 }));
    expect(brief(run("temp", steps.filter((x) => x.s <= 1800)).events)).toEqual([]);
    expect(brief(run("temp", steps).events)).toEqual(["fire flatline @3600"]);
  });

  it("is about the raw signal: no calibration note, but the flag is still set", () => {
    const steps = every(0, 900, 30, null).map((st) => ({ ...st, raw: 120 }));
    const { events } = run("ph", steps, { cal: "lapsed" });
    expect(brief(events)).toEqual(["fire flatline @900"]);
    expect(events[0].message).not.toContain("calibration");
    expect(events[0].calibrationLapsed).toBe(true);
  });
});

// ---------------------------------------------------------------------------------------
describe("buffer-like", () => {
  it.each([
    { v: 7.01, band: BANDS.ph, fires: true },
    { v: 4.0, band: BANDS.ph, fires: true },
    { v: 9.96, band: BANDS.ph, fires: true },
    { v: 7.07, band: BANDS.ph, fires: false }, // outside ±0.05
    { v: 7.0, band: { min: 6.5, max: 7.5 }, fires: false }, // the band includes 7.00
  ])("pH $v for 3 min (common practice), band $band.min–$band.max ⇒ fires: $fires", ({ v, band, fires }) => {
    const { events } = run("ph", every(0, 400, 10, v), { band: { ph: band } });
    expect(brief(events, "buffer-like")).toEqual(fires ? ["fire buffer-like @180"] : []);
  });

  it("says what it looks like and clears 30 s after the reading leaves the buffer", () => {
    const steps = [...every(0, 200, 10, 7.01), ...every(210, 400, 10, 6.0)];
    const { events } = run("ph", steps);
    expect(brief(events, "buffer-like")).toEqual(["fire buffer-like @180", "clear buffer-like @240"]);
    const fire = events.find((e) => e.cause === "buffer-like")!;
    expect(fire.message).toBe("pH 7.01 has sat at buffer 7.00 for 3 min outside the band 5.5–6.5 — is the probe still in buffer?");
    expect(fire.severity).toBe("critical");
    // it is also out of band; both are reported (separate incidents)
    expect(brief(events, "out-of-band")).toEqual(["fire out-of-band @120", "clear out-of-band @270"]);
  });

  it("only applies to pH", () => {
    expect(brief(run("ec", every(0, 400, 10, 4.0), { band: {} }).events)).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------
describe("out of solution", () => {
  it("EC below 0.05 mS/cm (common practice) fires after 60 s and clears 30 s after it recovers", () => {
    // Pulled out of a 1.0 mS/cm tank, then put back: no rate-of-change on either edge.
    const steps = [...every(-300, -10, 10, 1.0), ...every(0, 120, 10, 0.01), ...every(130, 300, 10, 1.0)];
    const { events } = run("ec", steps, { band: {} });
    expect(brief(events)).toEqual(["fire out-of-solution @60", "clear out-of-solution @160"]);
    expect(events[0].message).toBe("EC 0.01 mS/cm — probe may be out of solution or the tank empty");
    expect(events[1].message).toBe("EC back above 0.05 mS/cm (1.00 mS/cm)");
  });

  it.each([{ v: 0.05 }, { v: 0.3 }])("EC $v does not fire", ({ v }) => {
    expect(run("ec", every(0, 300, 10, v), { band: {} }).events).toEqual([]);
  });

  it("only applies to EC", () => {
    expect(run("ph", every(0, 300, 10, 0.01), { band: {} }).events.filter((e) => e.cause === "out-of-solution")).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------
describe("hold and settling", () => {
  const onHold = { active: true };

  it.each([
    { name: "out of band", measure: "ph" as const, v: 7.5 },
    { name: "buffer", measure: "ph" as const, v: 4.0 },
    { name: "implausible", measure: "ph" as const, v: 15 },
    { name: "out of solution", measure: "ec" as const, v: 0.0 },
    { name: "fast change", measure: "ph" as const, v: (s: number) => 4 + (s % 600) / 100 },
  ])("nothing fires on hold: $name", ({ measure, v }) => {
    const steps = every(0, 3600, 10, v).map((st) => ({ ...st, raw: 5 })); // also flat
    const { events, state } = run(measure, steps, { hold: onHold });
    expect(events).toEqual([]);
    expect(firingCauses(state)).toEqual([]);
  });

  it("readings flagged held are silent even if the tank record is not (yet) on hold", () => {
    expect(run("ph", every(0, 600, 10, 7.0, { q: "held" })).events).toEqual([]);
  });

  it("after release, reading rules wait for the 10 min settling period (common practice)", () => {
    const release = T0 + 600 * SEC;
    const steps = [
      ...every(0, 590, 10, 4.0, { hold: { active: true } }),
      ...every(600, 1500, 10, 6.8, { hold: { active: false, releasedAt: release } }),
    ];
    // settling ends at 1200 s; the 120 s band delay counts from there.
    expect(brief(run("ph", steps).events)).toEqual(["fire out-of-band @1320"]);
  });

  it("a cause firing when the hold is placed stays firing (held), then clears normally after settling", () => {
    const release = T0 + 1200 * SEC;
    const steps = [
      ...every(0, 290, 10, 6.8), // fires at 120
      ...every(300, 1190, 10, 4.0, { hold: { active: true } }), // cleaning and calibrating
      ...every(1200, 2200, 10, 6.0, { hold: { active: false, releasedAt: release } }),
    ];
    const { events, state } = run("ph", steps);
    // settling ends at 1800; in the clear zone from then, clears 60 s later
    expect(brief(events)).toEqual(["fire out-of-band @120", "clear out-of-band @1860"]);
    expect(firingCauses(state)).toEqual([]);
  });

  it("a cause still true after the hold does not fire twice", () => {
    const release = T0 + 1200 * SEC;
    const steps = [
      ...every(0, 290, 10, 6.8),
      ...every(300, 1190, 10, 6.8, { hold: { active: true } }),
      ...every(1200, 3000, 10, 6.8, { hold: { active: false, releasedAt: release } }),
    ];
    expect(brief(run("ph", steps).events)).toEqual(["fire out-of-band @120"]);
  });
});

// ---------------------------------------------------------------------------------------
describe("no double firing, persistence, purity", () => {
  it("a long excursion fires once", () => {
    expect(brief(run("ph", every(0, 4 * 3600, 10, 7.3)).events)).toEqual(["fire out-of-band @120"]);
  });

  it("duplicate and out-of-order readings are ignored", () => {
    let { state } = run("ph", every(0, 130, 10, 6.8));
    expect(isFiring(state, "out-of-band")).toBe(true);
    for (const s of [130, 60, 0]) {
      const r = evaluateReading({
        state,
        reading: { ts: T0 + s * SEC, value: 6.0, raw: 3, measure: "ph", quality: "ok" },
        tank: { band: BANDS, hold: { active: false } },
        calibration: { status: "current" },
      });
      expect(r.events).toEqual([]);
      expect(r.state).toEqual(state);
      state = r.state;
    }
  });

  it("restoring the state from JSON between readings (worker restart) changes nothing", () => {
    const steps = [...every(0, 200, 5, (s) => 6 + s / 60), ...every(205, 2000, 5, 6.0)];
    const a = run("ph", steps);
    const b = run("ph", steps, { roundTrip: true });
    expect(b.events).toEqual(a.events);
    expect(a.events.length).toBeGreaterThan(0);
  });

  it("restoreProbeState accepts null, garbage and partial objects", () => {
    expect(restoreProbeState(null)).toEqual(initialProbeState());
    expect(restoreProbeState("x")).toEqual(initialProbeState());
    const partial = restoreProbeState({ causes: { "out-of-band": { firing: true, firedAt: 5 } } });
    expect(isFiring(partial, "out-of-band")).toBe(true);
    expect(partial.causes.stale.firing).toBe(false);
  });

  it("does not mutate its input", () => {
    const { state } = run("ph", every(0, 100, 10, 6.8));
    const snapshot = JSON.stringify(state);
    const frozen = JSON.parse(snapshot) as ProbeAlertState;
    deepFreeze(frozen);
    const r = evaluateReading({
      state: frozen,
      reading: { ts: T0 + 200 * SEC, value: 6.8, raw: 1, measure: "ph", quality: "ok" },
      tank: { band: BANDS, hold: { active: false } },
      calibration: { status: "current" },
    });
    expect(r.events.map((e) => e.cause)).toEqual(["out-of-band"]);
    expect(JSON.stringify(frozen)).toBe(snapshot);
    expect(r.state).not.toBe(frozen);
  });

  it("does not mutate a state it returned, which it takes back without restoring it", () => {
    const { state } = run("ph", every(0, 100, 10, 6.8));
    const snapshot = JSON.stringify(state);
    deepFreeze(state);
    const r = evaluateReading({
      state,
      reading: { ts: T0 + 200 * SEC, value: 6.8, raw: 1, measure: "ph", quality: "ok" },
      tank: { band: BANDS, hold: { active: false } },
      calibration: { status: "current" },
    });
    expect(r.events.map((e) => e.cause)).toEqual(["out-of-band"]);
    expect(JSON.stringify(state)).toBe(snapshot);
    expect(r.state).not.toBe(state);
  });

  it("a step that changes nothing gives the same tracker back; one that does builds a new one", () => {
    const quiet = { firing: false, firedAt: null, pendingSince: null, clearingSince: null };
    expect(advanceTracker(quiet, CLEAR, 1000, 5000, 5000)).toBe(quiet);
    expect(advanceTracker(quiet, null, 1000, 5000, 5000)).toBe(quiet);
    const pending = advanceTracker(quiet, ACTIVE, 1000, 5000, 5000);
    expect(pending).toEqual({ firing: false, firedAt: null, pendingSince: 1000, clearingSince: null });
    expect(advanceTracker(pending, ACTIVE, 2000, 5000, 5000)).toBe(pending);
    const fired = advanceTracker(pending, ACTIVE, 6000, 5000, 5000);
    expect(stepTracker(pending, ACTIVE, { at: 6000, fireDelayMs: 5000, clearDelayMs: 5000 })).toEqual({ tracker: fired, transition: "fire" });
    expect(fired).toEqual({ firing: true, firedAt: 6000, pendingSince: null, clearingSince: null });
    expect(advanceTracker(fired, ACTIVE, 7000, 5000, 5000)).toBe(fired);
    const clearing = advanceTracker(fired, CLEAR, 8000, 5000, 5000);
    expect(clearing).toEqual({ firing: true, firedAt: 6000, pendingSince: null, clearingSince: 8000 });
    expect(advanceTracker(clearing, CLEAR, 9000, 5000, 5000)).toBe(clearing);
    expect(stepTracker(clearing, CLEAR, { at: 13_000, fireDelayMs: 5000, clearDelayMs: 5000 })).toEqual({ tracker: quiet, transition: "clear" });
    // The shared conditions cannot be changed by a caller.
    expect(Object.isFrozen(ACTIVE) && Object.isFrozen(CLEAR)).toBe(true);
  });

  it("a disabled cause never fires, and one firing when disabled is cleared", () => {
    const off = mergeSettings({ causes: { "out-of-band": { enabled: false } } });
    expect(run("ph", every(0, 600, 10, 6.8), { settings: off }).events).toEqual([]);
    const { state } = run("ph", every(0, 200, 10, 6.8));
    const r = run("ph", [{ s: 210, v: 6.8 }], { state, settings: off });
    expect(brief(r.events)).toEqual(["clear out-of-band @210"]);
    expect(r.events[0].message).toBe("Out of band rule disabled");
  });
});

// ---------------------------------------------------------------------------------------
// Time rules
// ---------------------------------------------------------------------------------------
const CAL_OK: ProbeCalibrationInfo = {
  status: "current",
  lastAcceptedAt: T0 - 10 * DAY,
  dueAt: T0 + 20 * DAY,
  lastRunRejected: false,
  consecutiveRejections: 0,
};
const NO_HOLD = { active: false, placedAt: null, plannedEndAt: null, releasedAt: null };
const NO_INHIBIT = { active: false, plannedEndAt: null };

interface Tick {
  s: number;
  lastReadingS?: number | null;
  cal?: Partial<ProbeCalibrationInfo>;
  hold?: EvaluateTimeInput["tank"]["hold"];
  inhibit?: EvaluateTimeInput["tank"]["dosingInhibit"];
}

function tick(ticks: Tick[], o: { settings?: RuleSettings; measure?: Measure; state?: ProbeAlertState } = {}) {
  let state: ProbeAlertState = o.state ?? initialProbeState();
  let tankState: TankAlertState = initialTankState();
  const events: AlertEvent[] = [];
  for (const t of ticks) {
    const r = evaluateTime({
      now: T0 + t.s * SEC,
      probes: [
        {
          probeId: "probe-1",
          measure: o.measure ?? "ph",
          state,
          lastReadingAt: t.lastReadingS === null ? null : T0 + (t.lastReadingS ?? t.s) * SEC,
          calibration: { ...CAL_OK, ...t.cal },
        },
      ],
      tank: { hold: t.hold ?? NO_HOLD, dosingInhibit: t.inhibit ?? NO_INHIBIT },
      tankState,
      settings: o.settings,
    });
    state = JSON.parse(JSON.stringify(r.probes[0].state)) as ProbeAlertState;
    tankState = JSON.parse(JSON.stringify(r.tankState)) as TankAlertState;
    events.push(...r.events);
  }
  return { state, tankState, events };
}

/** A tick every 30 s (the scheduler's period) from `from` to `to`. */
function ticks(from: number, to: number, f: (s: number) => Omit<Tick, "s">): Tick[] {
  const out: Tick[] = [];
  for (let s = from; s <= to; s += 30) out.push({ s, ...f(s) });
  return out;
}

describe("stale", () => {
  it("fires once after 120 s without data (common practice) and clears when data returns", () => {
    const ts = [
      ...ticks(0, 600, () => ({ lastReadingS: 0 })), // last reading at 0
      ...ticks(630, 720, (s) => ({ lastReadingS: s - 1 })), // reporting again
    ];
    const { events } = tick(ts);
    expect(brief(events)).toEqual(["fire stale @150", "clear stale @630"]);
    expect(events[0]).toMatchObject({ probeId: "probe-1", measure: "ph", message: "pH probe: no data for 2 min", severity: "critical" });
    expect(events[1].message).toBe("pH probe reporting again");
  });

  it("exactly 120 s is not stale yet", () => {
    expect(tick([{ s: 120, lastReadingS: 0 }]).events).toEqual([]);
  });

  it("a probe that never reported is not judged stale", () => {
    expect(tick(ticks(0, 600, () => ({ lastReadingS: null }))).events).toEqual([]);
  });

  it("uses the reading state's last timestamp too", () => {
    const { state } = run("ph", [{ s: 500, v: 6.0 }]);
    expect(tick([{ s: 560, lastReadingS: 0 }], { state }).events).toEqual([]);
  });

  it("does not fire on hold, fires after the hold if still no data", () => {
    const held = { active: true, placedAt: T0, plannedEndAt: T0 + 3600 * SEC, releasedAt: null };
    const released = { active: false, placedAt: T0, plannedEndAt: T0 + 3600 * SEC, releasedAt: T0 + 900 * SEC };
    const ts = [...ticks(0, 870, () => ({ lastReadingS: 0, hold: held })), ...ticks(900, 960, () => ({ lastReadingS: 0, hold: released }))];
    expect(brief(tick(ts).events)).toEqual(["fire stale @900"]);
  });

  it("a hold on one probe silences only that probe: the tank's other probes still go stale", () => {
    const hold = { active: true, probeIds: ["ph-1"], placedAt: T0, plannedEndAt: T0 + 3600 * SEC, releasedAt: null };
    const r = evaluateTime({
      now: T0 + 600 * SEC,
      probes: (["ph", "ec", "temp"] as const).map((m) => ({ probeId: `${m}-1`, measure: m, state: null, lastReadingAt: T0, calibration: CAL_OK })),
      tank: { hold, dosingInhibit: NO_INHIBIT },
      tankState: null,
    });
    expect(r.events.map((e) => `${e.type} ${e.cause} ${e.probeId}`)).toEqual(["fire stale ec-1", "fire stale temp-1"]);
    // The same hold on the whole tank silences all three.
    const whole = evaluateTime({ now: T0 + 600 * SEC, probes: r.probes.map((p) => ({ ...p, state: null, lastReadingAt: T0, calibration: CAL_OK })), tank: { hold: { ...hold, probeIds: null }, dosingInhibit: NO_INHIBIT }, tankState: null });
    expect(whole.events).toEqual([]);
  });
});

describe("calibration causes", () => {
  it.each([
    {
      name: "due soon",
      cal: { status: "due-soon" as const, dueAt: T0 + 3 * DAY },
      fires: ["calibration-due-soon"],
      msg: "pH probe calibration due in 3 d",
      lapsed: false,
    },
    {
      name: "lapsed",
      cal: { status: "lapsed" as const, lastAcceptedAt: T0 - 34 * DAY },
      fires: ["calibration-lapsed"],
      msg: "pH probe calibration lapsed (last accepted 34 d ago) — readings may be off",
      lapsed: true,
    },
    {
      name: "never calibrated",
      cal: { status: "never" as const, lastAcceptedAt: null },
      fires: ["calibration-lapsed"],
      msg: "pH probe has never been calibrated — readings may be off",
      lapsed: true,
    },
    {
      name: "rejected once",
      cal: { lastRunRejected: true, consecutiveRejections: 1, lastRejectionReasons: ["slope 86 % below 90 %"] },
      fires: ["calibration-rejected"],
      msg: "pH probe calibration rejected (slope 86 % below 90 %) — clean and inspect the probe, then retry",
      lapsed: false,
    },
    {
      name: "rejected twice in a row (DOMAIN.md §1, common practice)",
      cal: { lastRunRejected: true, consecutiveRejections: 2 },
      fires: ["calibration-rejected", "probe-replace"],
      msg: "pH probe calibration rejected — clean and inspect the probe, then retry",
      lapsed: false,
    },
  ])("$name: fires once, clears once when the calibration is good again", ({ cal, fires, msg, lapsed }) => {
    const ts = [...ticks(0, 300, () => ({ cal })), ...ticks(330, 600, () => ({}))];
    const { events } = tick(ts);
    expect(brief(events)).toEqual([...fires.map((c) => `fire ${c} @0`), ...fires.map((c) => `clear ${c} @330`)]);
    expect(events[0].message).toBe(msg);
    expect(events[0].calibrationLapsed).toBe(lapsed);
  });

  it("probe-replace message", () => {
    const { events } = tick([{ s: 0, cal: { lastRunRejected: true, consecutiveRejections: 2 } }]);
    expect(events.find((e) => e.cause === "probe-replace")?.message).toBe(
      "pH probe calibration rejected 2 times in a row — replace the probe",
    );
  });

  it("lapsed replaces due-soon as the due date passes", () => {
    const ts = [{ s: 0, cal: { status: "due-soon" as const } }, { s: 30, cal: { status: "lapsed" as const } }];
    expect(brief(tick(ts).events)).toEqual([
      "fire calibration-due-soon @0",
      "clear calibration-due-soon @30",
      "fire calibration-lapsed @30",
    ]);
  });

  it("silenced on hold; an accepted calibration during the hold still clears", () => {
    const held = { active: true, placedAt: T0, plannedEndAt: T0 + 3600 * SEC, releasedAt: null };
    const released = { ...held, active: false, releasedAt: T0 + 1200 * SEC };
    const lapsedFirst = tick([{ s: 0, cal: { status: "lapsed" } }]);
    expect(brief(lapsedFirst.events)).toEqual(["fire calibration-lapsed @0"]);
    // hold, a rejected run, then an accepted run, all during the hold
    const r = tick(
      [
        ...ticks(30, 300, () => ({ hold: held, cal: { status: "lapsed", lastRunRejected: true, consecutiveRejections: 1 } })),
        ...ticks(330, 1170, () => ({ hold: held })),
        ...ticks(1200, 1300, () => ({ hold: released })),
      ],
      { state: lapsedFirst.state },
    );
    expect(brief(r.events)).toEqual(["clear calibration-lapsed @330"]);
  });

  it("a rejection during the hold fires after the release", () => {
    const held = { active: true, placedAt: T0, plannedEndAt: T0 + 3600 * SEC, releasedAt: null };
    const released = { ...held, active: false, releasedAt: T0 + 600 * SEC };
    const cal = { lastRunRejected: true, consecutiveRejections: 1 };
    const ts = [...ticks(0, 570, () => ({ hold: held, cal })), ...ticks(600, 700, () => ({ hold: released, cal }))];
    expect(brief(tick(ts).events)).toEqual(["fire calibration-rejected @600"]);
  });
});

describe("hold-overrun and dosing-inhibit-overrun", () => {
  const placedAt = T0;
  const plannedEndAt = T0 + 1800 * SEC;

  it("hold-overrun fires even on hold (the only alert that does), clears on release", () => {
    const held = { active: true, placedAt, plannedEndAt, releasedAt: null };
    const released = { ...held, active: false, releasedAt: T0 + 2700 * SEC };
    const ts = [
      ...ticks(0, 2670, () => ({ hold: held, lastReadingS: 0, cal: { status: "lapsed" as const } })), // stale + lapsed, but on hold
      ...ticks(2700, 2760, (s) => ({ hold: released, lastReadingS: s })),
    ];
    const { events } = tick(ts);
    expect(brief(events)).toEqual(["fire hold-overrun @1830", "clear hold-overrun @2700"]);
    expect(events[0]).toMatchObject({ measure: null, calibrationLapsed: false, severity: "warning" });
    expect(events[0].probeId).toBeUndefined();
    expect(events[0].message).toBe("Hold has run 30 s past its planned end — release or extend it");
    expect(events[1].message).toBe("Hold released");
  });

  it("extending the hold clears the overrun", () => {
    const held = { active: true, placedAt, plannedEndAt, releasedAt: null };
    const extended = { ...held, plannedEndAt: T0 + 3600 * SEC };
    const ts = [...ticks(1800, 1890, () => ({ hold: held })), ...ticks(1920, 2000, () => ({ hold: extended }))];
    const { events } = tick(ts);
    expect(brief(events)).toEqual(["fire hold-overrun @1830", "clear hold-overrun @1920"]);
    expect(events[1].message).toBe("Hold extended; no longer past its planned end");
  });

  it("a hold without a planned end never overruns", () => {
    const held = { active: true, placedAt, plannedEndAt: null, releasedAt: null };
    expect(tick(ticks(0, 7200, () => ({ hold: held }))).events).toEqual([]);
  });

  it("dosing inhibited past its planned end (+2 min grace, common practice) fires on hold", () => {
    const held = { active: true, placedAt, plannedEndAt: T0 + 7200 * SEC, releasedAt: null };
    const inhibit = { active: true, plannedEndAt };
    const ts = [
      ...ticks(0, 2100, () => ({ hold: held, inhibit })),
      ...ticks(2130, 2200, () => ({ hold: held, inhibit: { active: false, plannedEndAt } })),
    ];
    const { events } = tick(ts);
    expect(brief(events)).toEqual(["fire dosing-inhibit-overrun @1950", "clear dosing-inhibit-overrun @2130"]);
    expect(events[0].severity).toBe("critical");
    expect(events[1].message).toBe("Dosing resumed");
  });

  it("dosing still inhibited after the hold was released fires", () => {
    const released = { active: false, placedAt, plannedEndAt, releasedAt: T0 + 600 * SEC };
    const inhibit = { active: true, plannedEndAt: null };
    const { events } = tick(ticks(600, 900, () => ({ hold: released, inhibit })));
    expect(brief(events)).toEqual(["fire dosing-inhibit-overrun @750"]);
    expect(events[0].message).toBe("Dosing still inhibited 2 min after it should have resumed — check the controller");
  });
});

describe("time rules: repeat calls and shared state", () => {
  it("calling repeatedly with the returned state never fires twice", () => {
    const held = { active: true, placedAt: T0, plannedEndAt: T0, releasedAt: null };
    const ts = ticks(0, 3 * 3600, () => ({
      lastReadingS: 0,
      hold: held,
      inhibit: { active: true, plannedEndAt: T0 },
      cal: { status: "lapsed" as const, lastRunRejected: true, consecutiveRejections: 3 },
    }));
    const { events } = tick(ts);
    expect(brief(events)).toEqual(["fire hold-overrun @30", "fire dosing-inhibit-overrun @150"]);
  });

  it("every probe cause fires once together and once only when not on hold", () => {
    const ts = ticks(0, 3600, () => ({
      lastReadingS: -600,
      cal: { status: "lapsed" as const, lastRunRejected: true, consecutiveRejections: 2 },
    }));
    const { events, state } = tick(ts);
    expect(brief(events)).toEqual([
      "fire stale @0",
      "fire calibration-lapsed @0",
      "fire calibration-rejected @0",
      "fire probe-replace @0",
    ]);
    expect(firingCauses(state).sort()).toEqual(["calibration-lapsed", "calibration-rejected", "probe-replace", "stale"]);
  });

  it("reading evaluation keeps time-rule flags and vice versa", () => {
    const stale = tick([{ s: 0, lastReadingS: -600 }]).state;
    expect(isFiring(stale, "stale")).toBe(true);
    const afterReadings = run("ph", every(10, 200, 10, 6.8), { state: stale }).state;
    expect(isFiring(afterReadings, "stale")).toBe(true);
    expect(isFiring(afterReadings, "out-of-band")).toBe(true);
    const r = tick([{ s: 210, lastReadingS: 200 }], { state: afterReadings });
    expect(brief(r.events)).toEqual(["clear stale @210"]);
    expect(isFiring(r.state, "out-of-band")).toBe(true);
  });

  it("a disabled time cause does not fire", () => {
    const off = mergeSettings({ causes: { stale: { enabled: false } } });
    expect(tick(ticks(0, 600, () => ({ lastReadingS: 0 })), { settings: off }).events).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------
describe("calibrationStatusAt", () => {
  it.each([
    { lastAcceptedAt: null, dueAt: null, want: "never" },
    { lastAcceptedAt: T0 - DAY, dueAt: null, want: "current" },
    { lastAcceptedAt: T0 - 20 * DAY, dueAt: T0 + 10 * DAY, want: "current" },
    { lastAcceptedAt: T0 - 25 * DAY, dueAt: T0 + 5 * DAY, want: "due-soon" }, // 5 days: common practice
    { lastAcceptedAt: T0 - 29 * DAY, dueAt: T0 + DAY, want: "due-soon" },
    { lastAcceptedAt: T0 - 30 * DAY, dueAt: T0, want: "lapsed" },
  ])("last $lastAcceptedAt, due $dueAt ⇒ $want", ({ lastAcceptedAt, dueAt, want }) => {
    expect(calibrationStatusAt({ now: T0, lastAcceptedAt, dueAt })).toBe(want);
  });
});

describe("describeCause", () => {
  it("gives every cause a short, distinct label", () => {
    const labels = CAUSES.map(describeCause);
    expect(new Set(labels).size).toBe(CAUSES.length);
    for (const l of labels) expect(l.length).toBeGreaterThan(0);
    expect(describeCause("out-of-band")).toBe("Out of band");
    expect(describeCause("stale")).toBe("Stale data");
  });
});

function deepFreeze<T>(v: T): T {
  if (typeof v === "object" && v !== null) {
    for (const x of Object.values(v)) deepFreeze(x);
    Object.freeze(v);
  }
  return v;
}
