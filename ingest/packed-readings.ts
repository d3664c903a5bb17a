// The ingest's readings from the moment they are corrected: nine numbers a reading in one
// Float64Array a batch, not an object each. A batch lives from the first message it holds until
// its alert rules ran (a commit and a hook later), long enough for the garbage collector to copy
// every object in it twice and then promote it: objects per reading made the ingest's collector
// cost about as much CPU as its main thread. The same array crosses to the writer and alert
// threads as it is.
import { PROBE_KINDS, QUALITY_FLAGS, type ProbeKind, type QualityFlag } from "../db/schema";
import type { CommittedReading } from "./hooks";

const FIELDS = 9;
const ORG = 0;
const TANK = 1;
const PROBE = 2;
const KIND = 3;
const TS = 4;
const RAW = 5;
const VALUE = 6;
const QUALITY = 7;
const RUN = 8;
const KIND_INDEX = new Map(PROBE_KINDS.map((k, i) => [k, i]));
const QUALITY_INDEX = new Map(QUALITY_FLAGS.map((q, i) => [q, i]));

/** null travels as NaN: no value or run id is ever NaN (a NaN value is stored as null too). */
const orNaN = (x: number | null) => (x === null ? Number.NaN : x);
const orNull = (x: number) => (Number.isNaN(x) ? null : x);

/** A batch of committed (or to be committed) readings, read by index. */
export class PackedReadings {
  constructor(readonly data: Float64Array) {
    if (data.length % FIELDS !== 0) throw new Error(`packed readings have ${FIELDS} numbers each, not ${data.length} in all`);
  }

  get length(): number {
    return this.data.length / FIELDS;
  }
  orgId(i: number): number {
    return this.data[i * FIELDS + ORG];
  }
  tankId(i: number): number {
    return this.data[i * FIELDS + TANK];
  }
  probeId(i: number): number {
    return this.data[i * FIELDS + PROBE];
  }
  kind(i: number): ProbeKind {
    return PROBE_KINDS[this.data[i * FIELDS + KIND]];
  }
  ts(i: number): number {
    return this.data[i * FIELDS + TS];
  }
  raw(i: number): number {
    return this.data[i * FIELDS + RAW];
  }
  value(i: number): number | null {
    return orNull(this.data[i * FIELDS + VALUE]);
  }
  quality(i: number): QualityFlag {
    return QUALITY_FLAGS[this.data[i * FIELDS + QUALITY]];
  }
  calibrationRunId(i: number): number | null {
    return orNull(this.data[i * FIELDS + RUN]);
  }

  /** Reading `i` as an object (for tests and tools; the ingest reads the fields it needs). */
  at(i: number): CommittedReading {
    return {
      v: 1,
      orgId: this.orgId(i),
      tankId: this.tankId(i),
      probeId: this.probeId(i),
      kind: this.kind(i),
      ts: this.ts(i),
      raw: this.raw(i),
      value: this.value(i),
      quality: this.quality(i),
      calibrationRunId: this.calibrationRunId(i),
    };
  }

  /** The readings whose flag is 1 (`null`: all of them, this same batch). */
  keep(flags: Uint8Array | null): PackedReadings {
    if (flags === null) return this;
    if (flags.length !== this.length) throw new Error(`${flags.length} flags for ${this.length} readings`);
    const out = new Float64Array(flags.reduce((n, f) => n + f, 0) * FIELDS);
    let to = 0;
    for (let i = 0; i < flags.length; i++) {
      if (!flags[i]) continue;
      out.set(this.data.subarray(i * FIELDS, (i + 1) * FIELDS), to);
      to += FIELDS;
    }
    return new PackedReadings(out);
  }

  /** This batch followed by `next`, as one. */
  concat(next: PackedReadings): PackedReadings {
    const out = new Float64Array(this.data.length + next.data.length);
    out.set(this.data);
    out.set(next.data, this.data.length);
    return new PackedReadings(out);
  }
}

/** Collects readings one at a time into one growing array, reused from batch to batch. */
export class PackedReadingsBuilder {
  private data = new Float64Array(FIELDS * 1024);
  private n = 0;

  get length(): number {
    return this.n;
  }

  push(orgId: number, tankId: number, probeId: number, kind: ProbeKind, ts: number, raw: number, value: number | null, quality: QualityFlag, calibrationRunId: number | null): void {
    let at = this.n * FIELDS;
    if (at + FIELDS > this.data.length) {
      const grown = new Float64Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    const d = this.data;
    d[at++] = orgId;
    d[at++] = tankId;
    d[at++] = probeId;
    d[at++] = KIND_INDEX.get(kind)!;
    d[at++] = ts;
    d[at++] = raw;
    d[at++] = orNaN(value);
    d[at++] = QUALITY_INDEX.get(quality)!;
    d[at] = orNaN(calibrationRunId);
    this.n++;
  }

  /** The readings collected so far, as a batch of their own; the builder is empty again. */
  take(): PackedReadings {
    const out = new PackedReadings(this.data.slice(0, this.n * FIELDS));
    this.n = 0;
    return out;
  }
}

export function packReadings(readings: readonly CommittedReading[]): PackedReadings {
  const b = new PackedReadingsBuilder();
  for (const r of readings) b.push(r.orgId, r.tankId, r.probeId, r.kind, r.ts, r.raw, r.value, r.quality, r.calibrationRunId);
  return b.take();
}

export function unpackReadings(packed: PackedReadings): CommittedReading[] {
  return Array.from({ length: packed.length }, (_, i) => packed.at(i));
}
