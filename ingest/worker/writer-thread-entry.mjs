// The writer thread's entry point. A worker thread does not inherit the TypeScript loader the
// ingest runs under, so this plain module registers tsx in the thread, then loads the writer.
import { register } from "tsx/esm/api";

register();
await import("./writer-thread.ts");
