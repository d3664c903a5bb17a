// The main thread's side of the writer thread (./writer-thread.ts): the same `ReadingWriter`
// contract as writing in place. A write resolves after its transaction committed on the thread,
// so the pipeline still acknowledges only committed messages. If the thread dies, the writes in
// flight fail (the pipeline keeps their batch and retries) and the next write starts a new thread.
import { ThreadCalls } from "../thread";
import type { ReadingWriter, WriterOptions } from "./batch-writer";
import type { DeadLetter } from "./refusals";
import type { PackedReadings } from "../packed-readings";
import type { WriteReply, WriteRequest } from "./writer-protocol";

export class ThreadedWriter implements ReadingWriter {
  private readonly calls: ThreadCalls<WriteRequest, WriteReply>;

  constructor(o: WriterOptions) {
    this.calls = new ThreadCalls({
      name: "writer",
      module: new URL("./writer-thread.ts", import.meta.url),
      data: { writer: o },
      isReply: (m): m is WriteReply => typeof m === "object" && m !== null && "ok" in m,
    });
  }

  async write(rows: PackedReadings, deadLetters: DeadLetter[], seen: Map<string, number>): Promise<PackedReadings> {
    // Copied, not moved: the batch is streamed and handed to the alert rules after its commit.
    const reply = await this.calls.call((id) => ({ id, kind: "batch", rows: rows.data, deadLetters, seen: [...seen] }));
    if (!reply.ok) throw new Error(reply.error);
    return rows.keep(reply.inserted);
  }

  async writeStatus(name: string, at: number, statsJson: string): Promise<void> {
    const reply = await this.calls.call((id) => ({ id, kind: "status", name, at, statsJson }));
    if (!reply.ok) throw new Error(reply.error);
  }

  close(): void {
    this.calls.stop("close"); // the thread closes its database and ends
  }
}
