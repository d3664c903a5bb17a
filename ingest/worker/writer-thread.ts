// The ingest's SQLite writer, on a thread of its own: inserting the rows and their rollups was
// the largest share of the main thread's CPU, which also reads the broker, decodes, corrects
// and runs the alert rules. While a batch commits here, the main thread goes on with the next.
// One transaction per request, as before; the main thread acknowledges after the reply.
import { parentPort, workerData } from "node:worker_threads";
import { NativeWriter, type WriterOptions } from "./batch-writer";
import { PackedReadings } from "../packed-readings";
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
    if (m.kind === "status") {
      writer.writeStatus(m.name, m.at, m.statsJson);
      reply = { id: m.id, ok: true, inserted: null };
    } else {
      reply = { id: m.id, ok: true, inserted: writer.write(new PackedReadings(m.rows), m.deadLetters, new Map(m.seen)) };
    }
  } catch (err) {
    reply = { id: m.id, ok: false, error: err instanceof Error ? err.message : String(err) };
  }
  port.postMessage(reply);
});
