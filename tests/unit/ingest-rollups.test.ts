// The ingest's rollups of a batch: per probe and minute, and per probe and hour, of the rows that
// were new; checked against a plain grouping of the same rows.
import { describe, expect, it } from "vitest";
import { PackedReadingsBuilder } from "@/ingest/packed-readings";
import { aggregateRollups, hourlyOf, MINUTE_MS, HOUR_MS } from "@/ingest/worker/rollups";

const T = Date.UTC(2026, 11, 3, 10, 59, 30);

function grouped(rows: { probeId: number; ts: number; value: number | null }[], unit: number) {
  const out = new Map<string, { probeId: number; minute: number; min: number; max: number; sum: number; count: number }>();
  for (const r of rows) {
    if (r.value === null) continue;
    const minute = Math.floor(r.ts / unit) * unit;
    const k = `${r.probeId}@${minute}`;
    const d = out.get(k) ?? { probeId: r.probeId, minute, min: r.value, max: r.value, sum: 0, count: 0 };
    d.min = Math.min(d.min, r.value);
    d.max = Math.max(d.max, r.value);
    d.sum += r.value;
    d.count++;
    out.set(k, d);
  }
  return [...out.values()];
}

const byKey = (a: { probeId: number; minute: number }, b: { probeId: number; minute: number }) => a.probeId - b.probeId || a.minute - b.minute;

describe("rollups of a batch", () => {
  const rows = Array.from({ length: 400 }, (_, i) => ({
    probeId: [1, 2, 70_000_000][i % 3], // a large id must not collide with another probe's minutes
    ts: T + i * 1700,
    value: i % 17 === 0 ? null : 5 + Math.sin(i) * 2,
  }));
  const packed = new PackedReadingsBuilder();
  for (const r of rows) packed.push(1, 1, r.probeId, "ph", r.ts, 0, r.value, "ok", null);
  const batch = packed.take();

  it("sum up each probe's minutes and hours, skipping rows without a value", () => {
    const minutes = aggregateRollups(batch);
    expect([...minutes].sort(byKey)).toEqual(grouped(rows, MINUTE_MS).sort(byKey));
    expect([...hourlyOf(minutes)].sort(byKey).map((d) => ({ ...d, sum: Math.round(d.sum * 1e9) / 1e9 }))).toEqual(
      grouped(rows, HOUR_MS)
        .sort(byKey)
        .map((d) => ({ ...d, sum: Math.round(d.sum * 1e9) / 1e9 })),
    );
  });

  it("count only the rows flagged new", () => {
    const isNew = Uint8Array.from(rows, (_, i) => (i % 2 === 0 ? 1 : 0));
    expect([...aggregateRollups(batch, isNew)].sort(byKey)).toEqual(grouped(rows.filter((_, i) => i % 2 === 0), MINUTE_MS).sort(byKey));
  });
});
