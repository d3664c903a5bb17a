import { describe, expect, it } from "vitest";
import { readingBatch } from "../../ingest/payloads";
import type { CommittedReading } from "../../ingest/hooks";
import { packReadings } from "../../ingest/packed-readings";
import { encodeReadingBatch } from "../../ingest/worker/live-batch";

const row = (over: Partial<CommittedReading>): CommittedReading => ({
  v: 1,
  probeId: 7,
  ts: 1_764_000_000_123,
  raw: -12.5,
  value: 6.04,
  quality: "ok",
  calibrationRunId: 3,
  kind: "ph",
  tankId: 2,
  orgId: 1,
  ...over,
});

describe("encodeReadingBatch", () => {
  it("writes exactly what JSON.stringify writes for the same batch", () => {
    const rows = [row({}), row({ probeId: 8, kind: "ec", raw: 1830.25, value: 1.7e3, quality: "lapsed", calibrationRunId: null }), row({ kind: "temp", value: null, quality: "held", raw: 0 }), row({ value: -0, raw: 1e-7 })];
    const expected = JSON.stringify({
      v: 1,
      readings: rows.map((r) => ({ v: 1, orgId: r.orgId, tankId: 2, probeId: r.probeId, kind: r.kind, ts: r.ts, raw: r.raw, value: r.value, quality: r.quality })),
    });
    const all = rows.map((_, i) => i);
    expect(encodeReadingBatch(2, packReadings(rows), all)).toBe(expected);
    expect(readingBatch.safeParse(JSON.parse(encodeReadingBatch(2, packReadings(rows), all))).success).toBe(true);
  });

  it("writes only the readings at the given places, in their order", () => {
    const rows = [row({ probeId: 1 }), row({ probeId: 2, tankId: 5 }), row({ probeId: 3 })];
    expect(JSON.parse(encodeReadingBatch(2, packReadings(rows), [2, 0])).readings.map((r: { probeId: number }) => r.probeId)).toEqual([3, 1]);
  });

  it("writes a non-finite number as null, as JSON does", () => {
    expect(JSON.parse(encodeReadingBatch(2, packReadings([row({ value: Number.NaN })]), [0])).readings[0].value).toBeNull();
  });
});
