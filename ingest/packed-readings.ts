// Readings as they cross to the ingest's worker threads (the SQLite writer, the alert rules):
// one transferred Float64Array a batch, nine numbers a reading, not objects. Cloning an object
// per reading would cost the main thread about what the thread's work on it costs.
import { PROBE_KINDS, QUALITY_FLAGS } from "../db/schema";
import type { CommittedReading } from "./hooks";

const FIELDS = 9;
const KIND_INDEX = new Map(PROBE_KINDS.map((k, i) => [k, i]));
const QUALITY_INDEX = new Map(QUALITY_FLAGS.map((q, i) => [q, i]));

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
