// The ingest's hooks on a thread of their own: the alert rules ran on the main thread for every
// committed reading, next to reading the broker, decoding and correcting. The main thread now
// hands each batch over and waits for it (the hook contract holds: one batch at a time, in
// commit order), and reads the broker meanwhile. If the thread dies, the batch in flight is
// counted as a hook error (as an error in place would be) and the next batch starts a new thread,
// which restores the rules' state from the database.
import type { HookContext, IngestHooks } from "../hooks";
import { ThreadCalls } from "../thread";
import type { PackedReadings } from "../packed-readings";
import type { FromAlertThread, ToAlertThread } from "./thread-protocol";

type BatchRequest = Extract<ToAlertThread, { kind: "readings" }>;
type BatchDone = Extract<FromAlertThread, { kind: "done" }>;

export function startThreadedHooks(ctx: HookContext): IngestHooks {
  // Started now: the runner's first tick and the lease do not wait for the first batch.
  const calls: ThreadCalls<BatchRequest, BatchDone> = new ThreadCalls({
    name: "alert",
    module: new URL("./alert-thread.ts", import.meta.url),
    data: { electedAs: ctx.electedAs },
    isReply: (m): m is BatchDone => (m as FromAlertThread).kind === "done",
    onOther: (m) => {
      const { id, topic, payload, opts } = m as Extract<FromAlertThread, { kind: "publish" }>;
      const answer = (error: string | null) => calls.post({ kind: "published", id, error } satisfies ToAlertThread);
      ctx.publish(topic, payload, opts).then(
        () => answer(null),
        (err: unknown) => answer(err instanceof Error ? err.message : String(err)),
      );
    },
  });

  return {
    async onReadingsCommitted(readings: PackedReadings) {
      // Moved, not copied: the pipeline is done with a batch once its hook runs.
      const rows = readings.data;
      await calls.call((id) => ({ kind: "readings", id, rows }), [rows.buffer as ArrayBuffer]);
    },
    stop() {
      calls.stop({ kind: "stop" } satisfies ToAlertThread);
    },
  };
}
