// What the ingest's main thread and its writer thread say to each other. Rows cross packed
// (../packed-readings.ts): the array of a `PackedReadings`.
import type { DeadLetter } from "./refusals";

export type WriteRequest =
  | { id: number; kind: "batch"; rows: Float64Array; deadLetters: DeadLetter[]; seen: [string, number][] }
  | { id: number; kind: "status"; name: string; at: number; statsJson: string };

/** `inserted`: one byte per row, 1 when it was new; null when every row was. */
export type WriteReply = { id: number; ok: true; inserted: Uint8Array | null } | { id: number; ok: false; error: string };
