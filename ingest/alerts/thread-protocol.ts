// What the ingest's main thread and its alert thread say to each other. Committed readings
// cross as one transferred Float64Array (nine numbers a reading), not as objects, so handing a
// batch over costs the main thread little; the thread's MQTT publishes go back to the main
// thread, which holds the broker connection.
import { PROBE_KINDS, QUALITY_FLAGS } from "../../db/schema";
import type { CommittedReading } from "../hooks";
import type { PublishOptions } from "./publish";

const FIELDS = 9;
const KIND_INDEX = new Map(PROBE_KINDS.map((k, i) => [k, i]));
const QUALITY_INDEX = new Map(QUALITY_FLAGS.map((q, i) => [q, i]));

export type ToAlertThread =
  | { kind: "readings"; id: number; rows: Float64Array }
  | { kind: "published"; id: number; error: string | null }
  | { kind: "stop" };

export type FromAlertThread = { kind: "done"; id: number } | { kind: "publish"; id: number; topic: string; payload: string; opts: PublishOptions };

/** null travels as NaN: no value or run id is ever NaN. */
export function packReadings(readings: readonly CommittedReading[]): Float64Array {
  const out = new Float64Array(readings.length * FIELDS);
  let at = 0;
  for (const r of readings) {
    out[at++] = r.orgId;
    out[at++] = r.tankId;
    out[at++] = r.probeId;
    out[at++] = KIND_INDEX.get(r.kind)!;
    out[at++] = r.ts;
    out[at++] = r.raw;
    out[at++] = r.value ?? Number.NaN;
    out[at++] = QUALITY_INDEX.get(r.quality)!;
    out[at++] = r.calibrationRunId ?? Number.NaN;
  }
  return out;
}

export function unpackReadings(packed: Float64Array): CommittedReading[] {
  const out: CommittedReading[] = [];
  for (let at = 0; at < packed.length; at += FIELDS) {
    const value = packed[at + 6];
    const run = packed[at + 8];
    out.push({
      v: 1,
      orgId: packed[at],
      tankId: packed[at + 1],
      probeId: packed[at + 2],
      kind: PROBE_KINDS[packed[at + 3]],
      ts: packed[at + 4],
      raw: packed[at + 5],
      value: Number.isNaN(value) ? null : value,
      quality: QUALITY_FLAGS[packed[at + 7]],
      calibrationRunId: Number.isNaN(run) ? null : run,
    });
  }
  return out;
}
