// Starts one of the ingest's worker threads (see thread-entry.mjs) with its data.
import { Worker } from "node:worker_threads";

const ENTRY = new URL("./thread-entry.mjs", import.meta.url);

/** `module`: the thread's TypeScript module, as a URL (e.g. new URL("./x.ts", import.meta.url)). */
export function startThread(module: URL, data: object): Worker {
  return new Worker(ENTRY, { workerData: { ...data, entry: module.href } });
}
