// The main thread's side of the writer thread (./writer-thread.ts): the same `ReadingWriter`
// contract as writing in place. A write resolves after its transaction committed on the thread,
// so the pipeline still acknowledges only committed messages. If the thread dies, the writes in
// flight fail (the pipeline keeps their batch and retries) and the next write starts a new thread.
import type { Worker } from "node:worker_threads";
import { startThread } from "../thread";
import type { PendingRow, ReadingWriter, WriterOptions } from "./batch-writer";
import type { DeadLetter } from "./refusals";
import { packReadings } from "../packed-readings";
import type { WriteReply, WriteRequest } from "./writer-protocol";

interface InFlight {
  rows: PendingRow[];
  resolve: (rows: PendingRow[]) => void;
  reject: (err: Error) => void;
}

export class ThreadedWriter implements ReadingWriter {
  private worker: Worker | null = null;
  private readonly inFlight = new Map<number, InFlight>();
  private nextId = 1;

  constructor(private readonly o: WriterOptions) {
    this.thread(); // started now, so a database it cannot open shows at start-up
  }

  private thread(): Worker {
    if (this.worker) return this.worker;
    const worker = startThread(new URL("./writer-thread.ts", import.meta.url), { writer: this.o });
    worker.on("message", (reply: WriteReply) => {
      const w = this.inFlight.get(reply.id);
      if (!w) return;
      this.inFlight.delete(reply.id);
      if (!reply.ok) w.reject(new Error(reply.error));
      else if (reply.inserted === null) w.resolve(w.rows);
      else w.resolve(w.rows.filter((_, i) => reply.inserted![i] === 1));
    });
    const lost = (why: string) => {
      if (this.worker !== worker) return;
      this.worker = null;
      for (const w of this.inFlight.values()) w.reject(new Error(`the writer thread ${why}`));
      this.inFlight.clear();
    };
    worker.on("error", (err) => lost(`failed: ${err.message}`));
    worker.on("exit", (code) => lost(`exited with code ${code}`));
    this.worker = worker;
    return worker;
  }

  write(rows: PendingRow[], deadLetters: DeadLetter[], seen: Map<string, number>): Promise<PendingRow[]> {
    const id = this.nextId++;
    const request: WriteRequest = { id, rows: packReadings(rows), deadLetters, seen: [...seen] };
    return new Promise((resolve, reject) => {
      this.inFlight.set(id, { rows, resolve, reject });
      this.thread().postMessage(request, [request.rows.buffer as ArrayBuffer]);
    });
  }

  close(): void {
    const worker = this.worker;
    this.worker = null;
    worker?.postMessage("close"); // the thread closes its database and ends
  }
}
