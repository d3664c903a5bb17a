// A seeded SQLite database of its own for each test (or bench run): migrated and seeded with
// seedIfEmpty at a fixed `now`. Seeding takes seconds, so the first call builds a template
// (cached in the temp directory, keyed by the migrations, the seed code and `now`) and every
// call copies it to a fresh file.
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import * as schema from "../../../db/schema";
import { MIGRATIONS_FOLDER } from "../../../db/migrate";
import { seedIfEmpty } from "../../../db/seed";
import { REPO_ROOT } from "./processes";

const DAY_MS = 86_400_000;

/** The seed's `now` for tests: midnight UTC today (history ends there; live data comes after). */
export function fixedSeedNow(at = Date.now()): number {
  return Math.floor(at / DAY_MS) * DAY_MS;
}

export interface TestDatabase {
  dir: string;
  file: string;
  /** DATABASE_URL for the processes. */
  url: string;
  /** The device credentials the seed wrote (per-controller MQTT username/password). */
  credentialsFile: string;
  seedNow: number;
  remove(): void;
}

function filesUnder(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile())
    .map((e) => path.join(e.parentPath, e.name))
    .sort();
}

function templateKey(now: number): string {
  const h = createHash("sha256").update(String(now));
  const sources = [
    ...filesUnder(MIGRATIONS_FOLDER),
    ...filesUnder(path.join(REPO_ROOT, "db", "seed")),
    path.join(REPO_ROOT, "db", "schema.ts"),
    path.join(REPO_ROOT, "scripts", "simulator", "model.ts"),
  ];
  for (const f of sources) if (fs.existsSync(f)) h.update(f).update(fs.readFileSync(f));
  return h.digest("hex").slice(0, 16);
}

async function buildTemplate(dbFile: string, credentialsFile: string, now: number): Promise<void> {
  const url = `file:${dbFile}`;
  const client = createClient({ url });
  try {
    await client.execute("PRAGMA journal_mode=WAL");
    const db = drizzle(client, { schema });
    await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
    await seedIfEmpty(db, client, { now, credentialsFile });
    await client.execute("PRAGMA wal_checkpoint(TRUNCATE)");
  } finally {
    client.close();
  }
}

const templates = new Map<string, Promise<{ db: string; credentials: string }>>();

function template(now: number): Promise<{ db: string; credentials: string }> {
  const key = templateKey(now);
  let p = templates.get(key);
  if (!p) {
    p = (async () => {
      const dir = path.join(os.tmpdir(), "tidewell-test-templates");
      fs.mkdirSync(dir, { recursive: true });
      const db = path.join(dir, `${key}.db`);
      const credentials = path.join(dir, `${key}.credentials.json`);
      if (fs.existsSync(db) && fs.existsSync(credentials)) return { db, credentials };
      // Built under a unique name and renamed, so concurrent runs never see a half-built file.
      const tmp = path.join(dir, `${key}.${process.pid}.${Date.now()}`);
      await buildTemplate(`${tmp}.db`, `${tmp}.credentials.json`, now);
      fs.renameSync(`${tmp}.credentials.json`, credentials);
      fs.renameSync(`${tmp}.db`, db);
      for (const ext of ["-wal", "-shm"]) fs.rmSync(`${tmp}.db${ext}`, { force: true });
      return { db, credentials };
    })();
    templates.set(key, p);
  }
  return p;
}

/** A fresh, migrated and seeded database in a temp directory of its own. */
export async function createSeededDatabase(opts: { now?: number; label?: string } = {}): Promise<TestDatabase> {
  const seedNow = opts.now ?? fixedSeedNow();
  const t = await template(seedNow);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `tidewell-${opts.label ?? "test"}-`));
  const file = path.join(dir, "tidewell.db");
  const credentialsFile = path.join(dir, "device-credentials.json");
  fs.copyFileSync(t.db, file);
  fs.copyFileSync(t.credentials, credentialsFile);
  return {
    dir,
    file,
    url: `file:${file}`,
    credentialsFile,
    seedNow,
    remove: () => fs.rmSync(dir, { recursive: true, force: true }),
  };
}
