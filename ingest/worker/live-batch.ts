// The live stream's message for one tank's new readings, written out by hand: this runs for
// every committed reading, and building an object per reading only to stringify it was a
// visible share of the ingest's CPU. The output is exactly JSON.stringify of a `ReadingBatch`
// (tests/unit/ingest-live-batch.test.ts holds it to that); kinds and quality flags are fixed
// words that need no escaping.
import type { PackedReadings } from "../packed-readings";

/** A number as JSON writes it: non-finite values become null. */
const num = (x: number | null): string => (x !== null && Number.isFinite(x) ? String(x) : "null");

/** The readings at `indexes` of `rows` (all of one tank) as one message. */
export function encodeReadingBatch(tankId: number, rows: PackedReadings, indexes: readonly number[]): string {
  let out = '{"v":1,"readings":[';
  for (let k = 0; k < indexes.length; k++) {
    const i = indexes[k];
    out +=
      (k ? "," : "") +
      `{"v":1,"orgId":${rows.orgId(i)},"tankId":${tankId},"probeId":${rows.probeId(i)},"kind":"${rows.kind(i)}","ts":${rows.ts(i)},"raw":${num(rows.raw(i))},"value":${num(rows.value(i))},"quality":"${rows.quality(i)}"}`;
  }
  return out + "]}";
}
