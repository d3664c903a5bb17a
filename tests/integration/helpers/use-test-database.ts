// The one set-up and teardown of a test database for integration tests. Call it at the top of a
// test file (or a describe block); it registers the vitest hooks itself:
//   - seeded (default): a copy of the seeded demo farm (createSeededDatabase), for tests that run
//     the real processes against it; everything those processes started is stopped afterwards.
//   - empty (`seed: false`): a migrated database with no rows, for tests that build their own.
// `per: "test"` (default) gives each test a fresh database; `per: "file"` shares one across the
// file (or describe block). Read `db`, `client` and `orm` inside tests and hooks, not at import.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, afterEach, beforeAll, beforeEach } from "vitest";
import type { Client } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import type { Db } from "../../../db/client";
import * as schema from "../../../db/schema";
import { MIGRATIONS_FOLDER } from "../../../db/migrate";
import { createSeededDatabase, type TestDatabase } from "./database";
import { stopAll } from "./processes";
import { openDb } from "./tidewell";

export interface TestDatabaseOptions {
  /** Names the temporary directory (tidewell-<label>-…), to tell runs apart when debugging. */
  label?: string;
  /** Seeded demo farm (default) or an empty, migrated database. */
  seed?: boolean;
  /** The seed's `now` (seeded databases only); midnight UTC today by default. */
  now?: number;
  /** A fresh database for each test (default) or one for the whole file or describe block. */
  per?: "test" | "file";
}

export interface UsedTestDatabase {
  /** The database's files and DATABASE_URL (for processes started against it). */
  readonly db: TestDatabase;
  /** A libSQL client on it, for assertions. */
  readonly client: Client;
  /** Drizzle over the same client, for calling the app's own queries. */
  readonly orm: Db;
}

async function createEmptyDatabase(label: string): Promise<TestDatabase> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `tidewell-${label}-`));
  const file = path.join(dir, "tidewell.db");
  const url = `file:${file}`;
  const db: TestDatabase = {
    dir,
    file,
    url,
    credentialsFile: path.join(dir, "device-credentials.json"),
    seedNow: Date.now(),
    remove: () => fs.rmSync(dir, { recursive: true, force: true }),
  };
  const client = openDb(db);
  try {
    await migrate(drizzle(client, { schema }), { migrationsFolder: MIGRATIONS_FOLDER });
  } finally {
    client.close();
  }
  return db;
}

export function useTestDatabase(options: TestDatabaseOptions = {}): UsedTestDatabase {
  const label = options.label ?? "test";
  let current: { db: TestDatabase; client: Client; orm: Db } | null = null;

  const setUp = async () => {
    const db = options.seed === false ? await createEmptyDatabase(label) : await createSeededDatabase({ label, now: options.now });
    const client = openDb(db);
    current = { db, client, orm: drizzle(client, { schema }) };
  };
  const tearDown = async () => {
    await stopAll();
    current?.client.close();
    current?.db.remove();
    current = null;
  };
  if (options.per === "file") {
    beforeAll(setUp);
    afterAll(tearDown);
  } else {
    beforeEach(setUp);
    afterEach(tearDown);
  }

  const live = () => {
    if (!current) throw new Error("useTestDatabase: read db, client and orm inside a test or hook");
    return current;
  };
  return {
    get db() {
      return live().db;
    },
    get client() {
      return live().client;
    },
    get orm() {
      return live().orm;
    },
  };
}
