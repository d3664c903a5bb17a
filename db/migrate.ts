import path from "node:path";
import { migrate } from "drizzle-orm/libsql/migrator";
import { getClient, getDb } from "./client";

export const MIGRATIONS_FOLDER = path.join(import.meta.dirname, "migrations");

/** Applies every committed migration not yet applied. Safe to run on every start. */
export async function applyMigrations(): Promise<void> {
  const client = getClient();
  await client.execute("PRAGMA journal_mode=WAL");
  await migrate(getDb(), { migrationsFolder: MIGRATIONS_FOLDER });
}
