// What the ingest's main thread and its writer thread say to each other. Rows cross as one
// transferred Float64Array (six numbers a row), not as objects: cloning an object per reading
// would cost the main thread about what writing it costs the writer thread.
import { QUALITY_FLAGS } from "../../db/schema";
import type { StoredRow } from "./batch-writer";
import type { DeadLetter } from "./refusals";

export const FIELDS_PER_ROW = 6;

export interface WriteRequest {
  id: number;
  rows: Float64Array;
  deadLetters: DeadLetter[];
  seen: [string, number][];
}

/** `inserted`: one byte per row, 1 when it was new; null when every row was. */
export type WriteReply = { id: number; ok: true; inserted: Uint8Array | null } | { id: number; ok: false; error: string };

const QUALITY_INDEX = new Map(QUALITY_FLAGS.map((q, i) => [q, i]));

/** null travels as NaN: no stored value or run id is ever NaN. */
export function packRows(rows: readonly StoredRow[]): Float64Array {
  const out = new Float64Array(rows.length * FIELDS_PER_ROW);
  let at = 0;
  for (const r of rows) {
    out[at++] = r.probeId;
    out[at++] = r.ts;
    out[at++] = r.raw;
    out[at++] = r.value ?? Number.NaN;
    out[at++] = QUALITY_INDEX.get(r.quality)!;
    out[at++] = r.calibrationRunId ?? Number.NaN;
  }
  return out;
}

export interface UnpackedRow extends StoredRow {
  /** The row's place in the batch. */
  index: number;
}

export function unpackRows(packed: Float64Array): UnpackedRow[] {
  const rows: UnpackedRow[] = [];
  for (let at = 0, index = 0; at < packed.length; at += FIELDS_PER_ROW, index++) {
    const value = packed[at + 3];
    const run = packed[at + 5];
    rows.push({
      index,
      probeId: packed[at],
      ts: packed[at + 1],
      raw: packed[at + 2],
      value: Number.isNaN(value) ? null : value,
      quality: QUALITY_FLAGS[packed[at + 4]],
      calibrationRunId: Number.isNaN(run) ? null : run,
    });
  }
  return rows;
}
