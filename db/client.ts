import path from "node:path";
import fs from "node:fs";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema>;

/** `DATABASE_URL`, or a SQLite file under `data/` in the working directory. */
export function databaseUrl(): string {
  const fromEnv = process.env.DATABASE_URL;
  if (fromEnv) return fromEnv;
  const dir = path.join(process.cwd(), "data");
  fs.mkdirSync(dir, { recursive: true });
  return `file:${path.join(dir, "tidewell.db")}`;
}

function open(url: string): { client: Client; db: Db } {
  if (url.startsWith("file:")) fs.mkdirSync(path.dirname(url.slice(5)), { recursive: true });
  // Several processes (ingest, web, seed) share the file: wait for locks rather than fail.
  const client = createClient({ url, authToken: process.env.DATABASE_AUTH_TOKEN, timeout: 10_000 });
  return { client, db: drizzle(client, { schema }) };
}

const globalForDb = globalThis as unknown as { __tidewellDb?: { url: string; client: Client; db: Db } };

/** One client per process (kept across hot reloads in development). */
export function getDb(): Db {
  return getConnection().db;
}

export function getClient(): Client {
  return getConnection().client;
}

function getConnection() {
  const url = databaseUrl();
  const cached = globalForDb.__tidewellDb;
  if (cached && cached.url === url) return cached;
  const opened = open(url);
  globalForDb.__tidewellDb = { url, ...opened };
  if (url.startsWith("file:")) {
    // WAL lets readers (web) run while the ingest writes; NORMAL sync is safe under WAL.
    void opened.client.executeMultiple("PRAGMA journal_mode=WAL; PRAGMA synchronous=NORMAL; PRAGMA foreign_keys=ON;");
  }
  return globalForDb.__tidewellDb;
}
