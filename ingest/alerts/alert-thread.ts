// The alert runner's thread (started by ./threaded.ts): it opens its own database connection and
// runs the same hooks the ingest would run in place, over the batches the main thread hands it,
// one at a time and in commit order. Its MQTT publishes (incident events, dosing commands) go
// through the main thread's broker connection.
import { parentPort, workerData } from "node:worker_threads";
import { getDb } from "../../db/client";
import { createInPlaceHooks } from "../hooks";
import { PackedReadings } from "../packed-readings";
import type { FromAlertThread, ToAlertThread } from "./thread-protocol";

const port = parentPort;
if (!port) throw new Error("alert-thread.ts runs as a worker thread of the ingest");
const send = (m: FromAlertThread) => port.postMessage(m);

let nextPublish = 1;
const publishing = new Map<number, { resolve: () => void; reject: (err: Error) => void }>();

const hooks = createInPlaceHooks({
  db: getDb(),
  electedAs: (workerData as { electedAs?: string }).electedAs,
  publish: (topic, payload, opts) =>
    new Promise<void>((resolve, reject) => {
      const id = nextPublish++;
      publishing.set(id, { resolve, reject });
      send({ kind: "publish", id, topic, payload, opts });
    }),
});

// Batches run one after another, as the hook contract says.
let queue: Promise<void> = Promise.resolve();

port.on("message", (m: ToAlertThread) => {
  if (m.kind === "readings") {
    queue = queue
      .then(() => hooks.onReadingsCommitted(new PackedReadings(m.rows)))
      .catch((err: unknown) => console.error("[alerts] evaluating a batch failed", err))
      .then(() => send({ kind: "done", id: m.id }));
  } else if (m.kind === "published") {
    const p = publishing.get(m.id);
    publishing.delete(m.id);
    if (m.error === null) p?.resolve();
    else p?.reject(new Error(m.error));
  } else {
    hooks.stop?.();
    port.close();
  }
});
