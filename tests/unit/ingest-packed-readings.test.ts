// The ingest keeps a batch's readings packed into one Float64Array from the moment they are
// corrected, and hands that array to its writer and alert threads; they must come back exactly
// as they went, nulls included.
import { describe, expect, it } from "vitest";
import type { CommittedReading } from "../../ingest/hooks";
import { PackedReadings, PackedReadingsBuilder, packReadings, unpackReadings } from "../../ingest/packed-readings";

const readings: CommittedReading[] = [
  { v: 1, orgId: 1, tankId: 2, probeId: 3, kind: "ph", ts: 1_764_000_000_001, raw: -57.25, value: 6.01, quality: "ok", calibrationRunId: 12 },
  { v: 1, orgId: 1, tankId: 2, probeId: 4, kind: "ec", ts: 1_764_000_000_002, raw: 1830.5, value: null, quality: "uncalibrated", calibrationRunId: null },
  { v: 1, orgId: 9, tankId: 7, probeId: 5, kind: "temp", ts: 1_764_000_000_003, raw: 20.5, value: 20.5, quality: "held", calibrationRunId: null },
  { v: 1, orgId: 9, tankId: 7, probeId: 6, kind: "ph", ts: 1_764_000_000_004, raw: 0, value: -0.5, quality: "suspect", calibrationRunId: 1 },
  { v: 1, orgId: 9, tankId: 7, probeId: 6, kind: "ph", ts: 1_764_000_000_005, raw: 1e-9, value: 14, quality: "lapsed", calibrationRunId: 2 },
];

describe("packed readings", () => {
  it("come back unchanged, in order", () => {
    expect(unpackReadings(packReadings(readings))).toEqual(readings);
  });

  it("an empty batch packs to nothing", () => {
    expect(unpackReadings(packReadings([]))).toEqual([]);
  });

  it("a batch read over another thread's copy of its array reads the same", () => {
    const copy = new PackedReadings(structuredClone(packReadings(readings).data));
    expect(unpackReadings(copy)).toEqual(readings);
  });

  it("the builder grows past its first array and starts empty after each take", () => {
    const b = new PackedReadingsBuilder();
    const many = Array.from({ length: 2500 }, (_, i) => ({ ...readings[i % readings.length], ts: 1_764_000_000_000 + i }));
    for (const r of many) b.push(r.orgId, r.tankId, r.probeId, r.kind, r.ts, r.raw, r.value, r.quality, r.calibrationRunId);
    expect(b.length).toBe(2500);
    expect(unpackReadings(b.take())).toEqual(many);
    expect(b.length).toBe(0);
    const r = readings[1];
    b.push(r.orgId, r.tankId, r.probeId, r.kind, r.ts, r.raw, r.value, r.quality, r.calibrationRunId);
    expect(unpackReadings(b.take())).toEqual([r]);
  });

  it("keeps the readings whose flag is set, and concatenates batches in order", () => {
    const packed = packReadings(readings);
    expect(packed.keep(null)).toBe(packed);
    expect(unpackReadings(packed.keep(Uint8Array.from([1, 0, 0, 1, 1])))).toEqual([readings[0], readings[3], readings[4]]);
    expect(packed.keep(new Uint8Array(5)).length).toBe(0);
    expect(() => packed.keep(new Uint8Array(4))).toThrow(/4 flags for 5 readings/);
    expect(unpackReadings(packReadings(readings.slice(3)).concat(packReadings(readings.slice(0, 3))))).toEqual([...readings.slice(3), ...readings.slice(0, 3)]);
  });

  it("refuses an array that is not whole readings", () => {
    expect(() => new PackedReadings(new Float64Array(10))).toThrow(/nine|9 numbers/);
  });
});
