// One simulated tank, stepped in real time: the nutrient solution (pH pushed up by nitrate
// uptake and pulled back by a simple acid-dosing controller; EC concentrated by evaporation,
// diluted by top-ups and raised by nutrient dosing), the day/night temperature, and the probes
// (electrode offset drifting and slope falling since the last accepted calibration, cell
// fouling, noise), plus faults and the calibration placement in buffers and standards.
import { bufferPh, BUFFER_IDS, ecStandardAt, type BufferId } from "../../lib/calibration";
import { agedElectrode, cellConductanceUs, DAY_MS, electrodeMv, rng, solutionTempC, type Electrode } from "./model";
import { noFaults, type FaultState, type Measure } from "./faults";
import type { SimTank } from "./fleet";

const HOUR = 3_600_000;
const PH_RISE_PER_H = 0.04; // nitrate uptake pushes pH up (common hydroponic behaviour)
const ACID_DOSE_PH = 0.12; // one acid pulse, once mixed
const NUTRIENT_DOSE_US = 60; // one nutrient pulse, µS/cm
const DOSE_COOLDOWN_MS = 10 * 60_000; // the controller waits for mixing before dosing again
const MIX_TAU_MS = 90_000;
const EVAPORATION_PCT_PER_H = 0.35;
const TOP_UP_BELOW_PCT = 94;
const PLACEMENT_TAU_MS = 120_000; // a probe in a cup of buffer takes the room's temperature

export type Placement = { kind: "ph-buffer"; buffer: BufferId } | { kind: "ec-standard"; ec25UsPerCm: number };

export function isBufferId(value: string): value is BufferId {
  return (BUFFER_IDS as readonly string[]).includes(value);
}

export interface Signals {
  ph: number; // mV
  ec: number; // µS
  temp: number; // °C
}

export class TankSim {
  faults: FaultState = noFaults();
  placement: { what: Placement; since: number; startTempC: number } | null = null;

  private ph: number;
  private ecUs: number;
  private levelPct = 100;
  private pendingAcid = 0;
  private pendingNutrient = 0;
  private nextDoseAt = 0;
  private drift = { ph: 0, ec: 0, temp: 0 };
  private last: Signals | null = null;
  private readonly random: () => number;
  private readonly seed: number;
  private readonly phBase: Electrode;
  private readonly phBaseAt: number;
  private readonly cellK: number;
  private readonly cellKAt: number;
  private readonly meanTempC: number;

  constructor(
    readonly tank: SimTank,
    copy: number,
    start: number,
  ) {
    this.seed = tank.id * 7919 + copy * 104_729;
    this.random = rng(this.seed);
    const b = tank.band;
    this.ph = (b.phMin + b.phMax) / 2 + (this.random() - 0.5) * 0.2;
    this.ecUs = (b.ecMinUs + b.ecMaxUs) / 2 + (this.random() - 0.5) * 80;
    this.meanTempC = (b.tempMin + b.tempMax) / 2 - 0.5 + this.random();
    // The electrode was what the last accepted calibration found, and has aged since.
    const ph = tank.probes.ph;
    this.phBase = {
      offsetMv: ph.calibration?.offsetMv ?? -6 + this.random() * 12,
      slopePct: ph.calibration?.slopePct ?? 98.5 - this.random(),
    };
    this.phBaseAt = ph.calibration?.effectiveAt ?? ph.installedAt;
    const ec = tank.probes.ec;
    this.cellK = ec.calibration?.cellConstant ?? (ec.nominalCellConstant ?? 1) * (0.97 + this.random() * 0.06);
    this.cellKAt = ec.calibration?.effectiveAt ?? ec.installedAt;
    this.nextDoseAt = start + this.random() * DOSE_COOLDOWN_MS;
  }

  /** Advances the solution by dtMs ending at t; `inhibited`: dosing is off (tank on hold). */
  step(t: number, dtMs: number, inhibited: boolean): void {
    const dtH = dtMs / HOUR;
    const band = this.tank.band;
    const oob = { ph: this.faults.probe.ph?.cause === "out-of-band", ec: this.faults.probe.ec?.cause === "out-of-band" };
    // pH: uptake pushes it up; acid pulses, once mixed, bring it down.
    this.ph += PH_RISE_PER_H * dtH + (this.random() - 0.5) * 0.002;
    const mixed = 1 - Math.exp(-dtMs / MIX_TAU_MS);
    this.ph -= this.pendingAcid * mixed;
    this.pendingAcid -= this.pendingAcid * mixed;
    // EC: evaporation concentrates the solution (faster by day); a top-up dilutes it.
    const daytime = Math.max(0, Math.sin((((t % DAY_MS) / DAY_MS) * 2 - 0.5) * Math.PI));
    const before = this.levelPct;
    this.levelPct -= EVAPORATION_PCT_PER_H * (0.5 + daytime) * dtH;
    this.ecUs *= before / this.levelPct;
    if (this.levelPct < TOP_UP_BELOW_PCT) {
      this.ecUs *= this.levelPct / 100;
      this.levelPct = 100;
    }
    this.ecUs += this.pendingNutrient * mixed;
    this.pendingNutrient -= this.pendingNutrient * mixed;
    // The controller: one pulse at a time, then it waits for mixing. Nothing while inhibited;
    // an out-of-band fault is a dosing line that does not deliver.
    if (!inhibited && t >= this.nextDoseAt) {
      const phHigh = band.phMin + (band.phMax - band.phMin) * 0.6;
      const ecLow = band.ecMinUs + (band.ecMaxUs - band.ecMinUs) * 0.3;
      if (this.ph > phHigh && !oob.ph) {
        this.pendingAcid += ACID_DOSE_PH;
        this.nextDoseAt = t + DOSE_COOLDOWN_MS;
      } else if (this.ecUs < ecLow && !oob.ec) {
        this.pendingNutrient += NUTRIENT_DOSE_US;
        this.nextDoseAt = t + DOSE_COOLDOWN_MS;
      }
    }
    // Out of band: the solution walks out of its band within about a minute.
    const pull = 1 - Math.exp(-dtMs / 20_000);
    if (oob.ph) this.ph += (band.phMax + 0.6 - this.ph) * pull;
    if (oob.ec) this.ecUs += (band.ecMaxUs * 1.3 - this.ecUs) * pull;
  }

  private solutionTemp(t: number): number {
    const oob = this.faults.probe.temp?.cause === "out-of-band";
    return solutionTempC(this.seed, t, this.meanTempC + (oob ? this.tank.band.tempMax - this.meanTempC + 4 : 0));
  }

  private airTemp(t: number): number {
    return solutionTempC(this.seed + 1, t, 22.5, 3);
  }

  /** The three raw signals the controller would read at t. */
  signals(t: number, dtMs: number): Signals {
    const n = () => this.random() - 0.5;
    const solutionC = this.solutionTemp(t);
    const days = (from: number) => Math.max(0, (t - from) / DAY_MS);
    const electrode = agedElectrode(this.phBase, days(this.phBaseAt));
    const kTrue = this.cellK * (1 + 0.0004 * days(this.cellKAt)); // fouling: reads a little low
    let phC = solutionC;
    let phTruth = this.ph;
    let conductance = cellConductanceUs(this.ecUs / 1000, solutionC, kTrue, this.tank.alphaPerC);
    let sensorC = solutionC;
    if (this.placement) {
      // In a cup of buffer or standard: the placed probe and the temperature sensor read it;
      // the other probe stays in the tank.
      const cupC = this.cupTemp(t);
      sensorC = cupC;
      const what = this.placement.what;
      if (what.kind === "ph-buffer") {
        phC = cupC;
        phTruth = bufferPh(what.buffer, Math.min(35, Math.max(10, cupC))); // tables cover 10–35 °C
      } else {
        conductance = ecStandardAt({ ec25UsPerCm: what.ec25UsPerCm, alphaPerC: 0.019 }, Math.min(40, Math.max(0, cupC))) / kTrue;
      }
    }
    const s: Signals = {
      ph: electrodeMv(phTruth, phC, electrode) + n() * 0.5,
      ec: conductance * (1 + n() * 0.004),
      temp: sensorC + n() * 0.06,
    };
    return this.withFaults(s, t, dtMs);
  }

  private withFaults(s: Signals, t: number, dtMs: number): Signals {
    const out = { ...s };
    for (const m of ["ph", "ec", "temp"] as Measure[]) {
      const f = this.faults.probe[m];
      if (!f) {
        this.drift[m] = 0;
        continue;
      }
      switch (f.cause) {
        case "stuck":
          f.frozen ??= this.last?.[m] ?? s[m];
          out[m] = f.frozen;
          break;
        case "out-of-solution":
          if (m === "ph") out.ph = 60 * Math.sin(t / 47_000) + (this.random() - 0.5) * 30; // a dry electrode wanders
          if (m === "ec") out.ec = this.random() * 0.8; // nothing conducts in air
          if (m === "temp") out.temp = this.airTemp(t) + (this.random() - 0.5) * 0.1;
          break;
        case "spike":
          out[m] = m === "ph" ? s.ph - 240 : m === "ec" ? s.ec * 3 : s.temp + 15;
          this.faults.probe[m] = null; // one sample, then gone
          break;
        case "fast-drift":
          // About half a pH unit, 10 % EC or 3 °C a minute.
          this.drift[m] += (dtMs / 1000) * (m === "ph" ? -0.5 : m === "ec" ? s.ec * 0.0017 : 0.05);
          out[m] = s[m] + this.drift[m];
          break;
        case "out-of-band":
          break; // already in the solution itself
      }
    }
    if (out.ec < 0) out.ec = 0;
    this.last = out;
    return out;
  }

  /** Places the probe in a buffer or standard (the caller checks the tank is held), or back in the tank. */
  place(what: Placement | "tank", t: number): void {
    if (what === "tank") {
      this.placement = null;
      return;
    }
    this.placement = { what, since: t, startTempC: this.placement ? this.cupTemp(t) : this.solutionTemp(t) };
  }

  /** A cup of buffer starts at the probe's temperature and settles to the room's. */
  private cupTemp(t: number): number {
    const p = this.placement!;
    const air = this.airTemp(t);
    return air + (p.startTempC - air) * Math.exp(-(t - p.since) / PLACEMENT_TAU_MS);
  }
}
