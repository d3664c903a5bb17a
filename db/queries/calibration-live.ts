// The live reading of a probe during a calibration run: recent raw and corrected readings from
// the readings table, the tank's temperature, and whether the raw signal has settled.
import { and, asc, desc, eq, gt, gte, lte } from "drizzle-orm";
import type { Db } from "../client";
import { readings, tanks, type ProbeKind, type QualityFlag } from "../schema";
import { ecFromConductance, fitEcStability, fitPhStability, parseStabilityWindowMs, phFromMv, type Stability } from "../../lib/calibration";
import { calibrationInForce, temperatureProbeOf, type ProbeRow } from "./calibration-scope";

/** The stability window: < 0.01 pH (or 0.5 % conductance) over 30 s by default; env CALIBRATION_STABILITY_WINDOW_MS. */
export const STABILITY_WINDOW_MS = parseStabilityWindowMs(process.env.CALIBRATION_STABILITY_WINDOW_MS);
/** A reading older than this is not live (the probe is disconnected or the controller offline). */
export const LIVE_FRESH_MS = 15_000;
/** The tank's temperature reading is used when it is this recent. */
export const TEMPERATURE_FRESH_MS = 2 * 60_000;
const HISTORY_MS = 2 * 60_000;

export interface LiveSample {
  ts: number;
  raw: number;
  value: number | null;
  quality: QualityFlag;
}

export interface LiveSnapshot {
  probe: { id: number; kind: ProbeKind; serial: string };
  readings: LiveSample[];
  latest: LiveSample | null;
  /** The latest reading is recent enough to capture. */
  fresh: boolean;
  temperature: { ts: number; value: number } | null;
  /** pH: spread in pH (raw mV through the calibration in force); EC: spread in % of the latest, at 25 °C. */
  stability: Stability & { unit: "pH" | "%"; windowMs: number };
}

/** Readings newer than `since` (at most two minutes back) plus the stability over the window. */
export async function liveSnapshot(db: Db, probe: ProbeRow, opts: { since?: number; now: number; asOf?: number }): Promise<LiveSnapshot> {
  const { now } = opts;
  // `asOf`: judge the reading at that time (the one the grower saw), ignoring later samples;
  // freshness is still measured against now.
  const upTo = Math.min(opts.asOf ?? now, now);
  const since = Math.max(opts.since ?? 0, now - HISTORY_MS);
  const recent = await db
    .select({ ts: readings.ts, raw: readings.raw, value: readings.value, quality: readings.quality })
    .from(readings)
    .where(and(eq(readings.probeId, probe.id), gt(readings.ts, since)))
    .orderBy(asc(readings.ts))
    .limit(300);
  // The window plus the sample before it, which holds the reading at the window's start.
  const windowRows = await db
    .select({ ts: readings.ts, raw: readings.raw })
    .from(readings)
    .where(and(eq(readings.probeId, probe.id), gte(readings.ts, upTo - STABILITY_WINDOW_MS - LIVE_FRESH_MS), lte(readings.ts, upTo)))
    .orderBy(desc(readings.ts))
    .limit(400);
  const [latestRow] = await db
    .select({ ts: readings.ts, raw: readings.raw, value: readings.value, quality: readings.quality })
    .from(readings)
    .where(and(eq(readings.probeId, probe.id), lte(readings.ts, upTo)))
    .orderBy(desc(readings.ts))
    .limit(1);

  const temperature = await latestTemperature(db, probe.tankId, now);
  // Each sample at its own temperature (automatic temperature compensation), so a buffer or
  // standard warming in its cup does not read as an unsettled probe. Conductance moves about
  // 2 % per °C, so without it an EC standard settling to the room's temperature hovers at the
  // 0.5 % limit for minutes and the verdict flips between polls.
  const temps = await temperatureSeries(db, probe.tankId, upTo - STABILITY_WINDOW_MS - LIVE_FRESH_MS - TEMPERATURE_FRESH_MS);
  const tempAt = (ts: number) => temps.findLast((t) => t.ts <= ts)?.value ?? temps[0]?.value ?? temperature?.value ?? 25;
  let stability: Stability;
  if (probe.kind === "ph") {
    const cal = (await calibrationInForce(db, probe.id, now)) ?? { slopePct: 100, offsetMv: 0 };
    const calibration = { slopePct: cal.slopePct ?? 100, offsetMv: cal.offsetMv ?? 0 };
    stability = fitPhStability(windowRows.map((r) => ({ t: r.ts, ph: phFromMv(r.raw, tempAt(r.ts), calibration) })), { windowMs: STABILITY_WINDOW_MS });
  } else {
    // The spread is relative, so the cell constant does not matter; the tank's coefficient is the
    // one its readings are compensated with.
    const [tank] = await db.select({ alphaPerC: tanks.ecAlphaPerC }).from(tanks).where(eq(tanks.id, probe.tankId)).limit(1);
    const compensation = { cellConstant: 1, alphaPerC: tank?.alphaPerC ?? 0.019 };
    stability = fitEcStability(
      windowRows.filter((r) => r.raw >= 0).map((r) => ({ t: r.ts, conductanceUs: ecFromConductance(r.raw, tempAt(r.ts), compensation) })),
      { windowMs: STABILITY_WINDOW_MS },
    );
  }
  const latest = latestRow ?? null;
  const fresh = latest !== null && now - latest.ts <= LIVE_FRESH_MS;
  return {
    probe: { id: probe.id, kind: probe.kind, serial: probe.serial },
    readings: recent,
    latest,
    fresh,
    temperature,
    stability: { ...stability, stable: stability.stable && fresh, unit: probe.kind === "ph" ? "pH" : "%", windowMs: STABILITY_WINDOW_MS },
  };
}

/** The tank's temperature readings since a time, oldest first. */
async function temperatureSeries(db: Db, tankId: number, since: number): Promise<{ ts: number; value: number }[]> {
  const tempProbe = await temperatureProbeOf(db, tankId);
  if (!tempProbe) return [];
  const rows = await db
    .select({ ts: readings.ts, raw: readings.raw, value: readings.value })
    .from(readings)
    .where(and(eq(readings.probeId, tempProbe.id), gte(readings.ts, since)))
    .orderBy(asc(readings.ts))
    .limit(600);
  return rows.map((r) => ({ ts: r.ts, value: r.value ?? r.raw }));
}

/** The tank's solution temperature, when its temperature probe reported in the last two minutes. */
export async function latestTemperature(db: Db, tankId: number, now: number): Promise<{ ts: number; value: number } | null> {
  const tempProbe = await temperatureProbeOf(db, tankId);
  if (!tempProbe) return null;
  const [row] = await db
    .select({ ts: readings.ts, raw: readings.raw, value: readings.value })
    .from(readings)
    .where(and(eq(readings.probeId, tempProbe.id), gte(readings.ts, now - TEMPERATURE_FRESH_MS)))
    .orderBy(desc(readings.ts))
    .limit(1);
  if (!row) return null;
  return { ts: row.ts, value: row.value ?? row.raw };
}
