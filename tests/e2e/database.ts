// The e2e tests' own connection to the stack's database. The ingest commits from its writer and
// alert threads while a test writes fixtures, so the connection waits for SQLite's write lock
// (as the app's own connections do) instead of failing at once with SQLITE_BUSY.
import { createClient, type Client } from "@libsql/client";
import { inject } from "vitest";

export function openStackDb(): Client {
  return createClient({ url: inject("databaseUrl"), timeout: 10_000 });
}
