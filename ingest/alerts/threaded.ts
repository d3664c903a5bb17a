// The ingest's hooks on a thread of their own: the alert rules ran on the main thread for every
// committed reading, next to reading the broker, decoding and correcting. The main thread now
// hands each batch over and waits for it (the hook contract holds: one batch at a time, in
// commit order), and reads the broker meanwhile. If the thread dies, the batch in flight is
// counted as a hook error (as an error in place would be) and the next batch starts a new thread,
// which restores the rules' state from the database.
import type { Worker } from "node:worker_threads";
import type { CommittedReading, HookContext, IngestHooks } from "../hooks";
import { startThread } from "../thread";
import { packReadings } from "../packed-readings";
import type { FromAlertThread, ToAlertThread } from "./thread-protocol";

export function startThreadedHooks(ctx: HookContext): IngestHooks {
  let worker: Worker | null = null;
  let nextId = 1;
  const waiting = new Map<number, { resolve: () => void; reject: (err: Error) => void }>();

  const thread = (): Worker => {
    if (worker) return worker;
    const w = startThread(new URL("./alert-thread.ts", import.meta.url), { electedAs: ctx.electedAs });
    const post = (m: ToAlertThread) => w.postMessage(m);
    w.on("message", (m: FromAlertThread) => {
      if (m.kind === "done") {
        waiting.get(m.id)?.resolve();
        waiting.delete(m.id);
      } else {
        ctx.publish(m.topic, m.payload, m.opts).then(
          () => post({ kind: "published", id: m.id, error: null }),
          (err: unknown) => post({ kind: "published", id: m.id, error: err instanceof Error ? err.message : String(err) }),
        );
      }
    });
    const lost = (why: string) => {
      if (worker !== w) return;
      worker = null;
      for (const p of waiting.values()) p.reject(new Error(`the alert thread ${why}`));
      waiting.clear();
    };
    w.on("error", (err) => lost(`failed: ${err.message}`));
    w.on("exit", (code) => lost(`exited with code ${code}`));
    worker = w;
    return w;
  };
  thread(); // started now: the runner's first tick and the lease do not wait for the first batch

  return {
    onReadingsCommitted(readings: readonly CommittedReading[]) {
      const id = nextId++;
      const rows = packReadings(readings);
      return new Promise<void>((resolve, reject) => {
        waiting.set(id, { resolve, reject });
        thread().postMessage({ kind: "readings", id, rows } satisfies ToAlertThread, [rows.buffer as ArrayBuffer]);
      });
    },
    stop() {
      worker?.postMessage({ kind: "stop" } satisfies ToAlertThread);
      worker = null;
    },
  };
}
