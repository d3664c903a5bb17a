// The live reading of a probe during a calibration run: recent raw and corrected readings from
// the readings table, the tank's temperature, and whether the raw signal has settled.
import { and, asc, desc, eq, gt, gte } from "drizzle-orm";
import type { Db } from "../client";
import { readings, type ProbeKind, type QualityFlag } from "../schema";
import { fitEcStability, fitPhStability, phFromMv, type Stability } from "../../lib/calibration";
import { calibrationInForce, temperatureProbeOf, type ProbeRow } from "./calibration-scope";

/** The stability window: < 0.01 pH (or 0.5 % conductance) over 30 s. */
export const STABILITY_WINDOW_MS = 30_000;
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
  /** pH: spread in pH (raw mV through the calibration in force); EC: spread in % of the latest. */
  stability: Stability & { unit: "pH" | "%" };
}

/** Readings newer than `since` (at most two minutes back) plus the stability of the last 30 s. */
export async function liveSnapshot(db: Db, probe: ProbeRow, opts: { since?: number; now: number }): Promise<LiveSnapshot> {
  const { now } = opts;
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
    .where(and(eq(readings.probeId, probe.id), gte(readings.ts, now - STABILITY_WINDOW_MS - LIVE_FRESH_MS)))
    .orderBy(desc(readings.ts))
    .limit(400);
  const [latestRow] = await db
    .select({ ts: readings.ts, raw: readings.raw, value: readings.value, quality: readings.quality })
    .from(readings)
    .where(eq(readings.probeId, probe.id))
    .orderBy(desc(readings.ts))
    .limit(1);

  const temperature = await latestTemperature(db, probe.tankId, now);
  let stability: Stability;
  if (probe.kind === "ph") {
    const cal = (await calibrationInForce(db, probe.id, now)) ?? { slopePct: 100, offsetMv: 0 };
    const calibration = { slopePct: cal.slopePct ?? 100, offsetMv: cal.offsetMv ?? 0 };
    // Each sample at its own temperature (automatic temperature compensation), so a buffer
    // warming in its cup does not read as an unsettled probe.
    const temps = await temperatureSeries(db, probe.tankId, now - STABILITY_WINDOW_MS - LIVE_FRESH_MS - TEMPERATURE_FRESH_MS);
    const tempAt = (ts: number) => temps.findLast((t) => t.ts <= ts)?.value ?? temps[0]?.value ?? temperature?.value ?? 25;
    stability = fitPhStability(windowRows.map((r) => ({ t: r.ts, ph: phFromMv(r.raw, tempAt(r.ts), calibration) })), { windowMs: STABILITY_WINDOW_MS });
  } else {
    stability = fitEcStability(windowRows.map((r) => ({ t: r.ts, conductanceUs: r.raw })), { windowMs: STABILITY_WINDOW_MS });
  }
  const latest = latestRow ?? null;
  const fresh = latest !== null && now - latest.ts <= LIVE_FRESH_MS;
  return {
    probe: { id: probe.id, kind: probe.kind, serial: probe.serial },
    readings: recent,
    latest,
    fresh,
    temperature,
    stability: { ...stability, stable: stability.stable && fresh, unit: probe.kind === "ph" ? "pH" : "%" },
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
