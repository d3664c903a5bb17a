// The ingest's SQLite writer, on a thread of its own: inserting the rows and their rollups was
// the largest share of the main thread's CPU, which also reads the broker, decodes, corrects
// and runs the alert rules. While a batch commits here, the main thread goes on with the next.
// One transaction per request, as before; the main thread acknowledges after the reply.
import { parentPort, workerData } from "node:worker_threads";
import { NativeWriter, type WriterOptions } from "./batch-writer";
import { unpackReadings } from "../packed-readings";
import type { WriteReply, WriteRequest } from "./writer-protocol";

const port = parentPort;
if (!port) throw new Error("writer-thread.ts runs as a worker thread of the ingest");
const writer = new NativeWriter((workerData as { writer: WriterOptions }).writer);

port.on("message", (m: WriteRequest | "close") => {
  if (m === "close") {
    writer.close();
    port.close();
    return;
  }
  let reply: WriteReply;
  try {
    const rows = unpackReadings(m.rows);
    const inserted = writer.write(rows, m.deadLetters, new Map(m.seen));
    let flags: Uint8Array | null = null;
    if (inserted.length !== rows.length) {
      // Only after a redelivery: which rows were new, by their place in the batch.
      const isNew = new Set(inserted);
      flags = Uint8Array.from(rows, (r) => (isNew.has(r) ? 1 : 0));
    }
    reply = { id: m.id, ok: true, inserted: flags };
  } catch (err) {
    reply = { id: m.id, ok: false, error: err instanceof Error ? err.message : String(err) };
  }
  port.postMessage(reply);
});
