import { describe, expect, it } from "vitest";
import { readingBatch } from "../../ingest/payloads";
import type { PendingRow } from "../../ingest/worker/batch-writer";
import { encodeReadingBatch } from "../../ingest/worker/live-batch";

const row = (over: Partial<PendingRow>): PendingRow => ({
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
    expect(encodeReadingBatch(2, rows)).toBe(expected);
    expect(readingBatch.safeParse(JSON.parse(encodeReadingBatch(2, rows))).success).toBe(true);
  });

  it("writes a non-finite number as null, as JSON does", () => {
    expect(JSON.parse(encodeReadingBatch(2, [row({ value: Number.NaN })])).readings[0].value).toBeNull();
  });
});
