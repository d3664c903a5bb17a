// Readings cross to the ingest's writer and alert threads packed into one Float64Array; they
// must come back exactly as they went, nulls included.
import { describe, expect, it } from "vitest";
import type { CommittedReading } from "../../ingest/hooks";
import { packReadings, unpackReadings } from "../../ingest/packed-readings";

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
});
