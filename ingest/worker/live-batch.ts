// The live stream's message for one tank's new readings, written out by hand: this runs for
// every committed reading, and building an object per reading only to stringify it was a
// visible share of the ingest's CPU. The output is exactly JSON.stringify of a `ReadingBatch`
// (tests/unit/ingest-live-batch.test.ts holds it to that); kinds and quality flags are fixed
// words that need no escaping.
import type { PendingRow } from "./batch-writer";

/** A number as JSON writes it: non-finite values become null. */
const num = (x: number | null): string => (x !== null && Number.isFinite(x) ? String(x) : "null");

export function encodeReadingBatch(tankId: number, rows: readonly PendingRow[]): string {
  let out = '{"v":1,"readings":[';
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    out +=
      (i ? "," : "") +
      `{"v":1,"orgId":${r.orgId},"tankId":${tankId},"probeId":${r.probeId},"kind":"${r.kind}","ts":${r.ts},"raw":${num(r.raw)},"value":${num(r.value)},"quality":"${r.quality}"}`;
  }
  return out + "]}";
}
