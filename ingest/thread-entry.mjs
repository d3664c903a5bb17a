// Entry point of the ingest's worker threads (the SQLite writer, the alert runner). A worker
// thread does not inherit the TypeScript loader the ingest runs under, so this plain module
// registers tsx in the thread, then loads the thread's own module, named by `workerData.entry`.
import { workerData } from "node:worker_threads";
import { register } from "tsx/esm/api";

register();
await import(workerData.entry);
