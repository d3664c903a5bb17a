// The ingest's worker threads (the SQLite writer, the alert rules; see thread-entry.mjs): started
// with their data, asked one request at a time by id, and started again after they die.
import { Worker } from "node:worker_threads";

const ENTRY = new URL("./thread-entry.mjs", import.meta.url);

/** `module`: the thread's TypeScript module, as a URL (e.g. new URL("./x.ts", import.meta.url)). */
export function startThread(module: URL, data: object): Worker {
  return new Worker(ENTRY, { workerData: { ...data, entry: module.href } });
}

interface Pending<Reply> {
  resolve: (reply: Reply) => void;
  reject: (err: Error) => void;
}

/**
 * A worker thread that answers requests by id. It starts at once (so a thread that cannot start
 * shows at start-up) and again on the next request after it died; requests in flight when it
 * dies fail with "the {name} thread …". Messages that are not replies go to `onOther`.
 */
export class ThreadCalls<Request extends { id: number }, Reply extends { id: number }> {
  private worker: Worker | null = null;
  private nextId = 1;
  private readonly waiting = new Map<number, Pending<Reply>>();

  constructor(
    private readonly o: {
      name: string;
      module: URL;
      data: object;
      isReply: (m: Reply | unknown) => m is Reply;
      onOther?: (m: unknown) => void;
    },
  ) {
    this.thread();
  }

  private thread(): Worker {
    if (this.worker) return this.worker;
    const worker = startThread(this.o.module, this.o.data);
    worker.on("message", (m: unknown) => {
      if (!this.o.isReply(m)) return this.o.onOther?.(m);
      this.waiting.get(m.id)?.resolve(m);
      this.waiting.delete(m.id);
    });
    const lost = (why: string) => {
      if (this.worker !== worker) return;
      this.worker = null;
      for (const p of this.waiting.values()) p.reject(new Error(`the ${this.o.name} thread ${why}`));
      this.waiting.clear();
    };
    worker.on("error", (err) => lost(`failed: ${err.message}`));
    worker.on("exit", (code) => lost(`exited with code ${code}`));
    this.worker = worker;
    return worker;
  }

  /** Sends the request `make` builds for a fresh id (moving `transfer`); resolves with its reply. */
  call(make: (id: number) => Request, transfer: ArrayBuffer[] = []): Promise<Reply> {
    const request = make(this.nextId++);
    return new Promise((resolve, reject) => {
      this.waiting.set(request.id, { resolve, reject });
      this.thread().postMessage(request, transfer);
    });
  }

  /** A message that wants no reply, to the thread running now (none is started for it). */
  post(message: unknown): void {
    this.worker?.postMessage(message);
  }

  /** Sends the thread its last message (it ends itself); a later call starts a new thread. */
  stop(message: unknown): void {
    this.post(message);
    this.worker = null;
  }
}
