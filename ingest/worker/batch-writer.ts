// One flush = one write transaction: new readings (exact duplicates of a stored probe+ts are
// ignored), the minute and hourly rollups of exactly the rows that were new, dead-letter samples, and devices'
// last-seen times. The ingest acknowledges the batch's MQTT messages only after this commits.
//
// For a local SQLite file the writer uses the libsql driver directly: multi-row INSERTs
// prepared once per size, run inside one transaction. A chunk whose change count shows a
// duplicate is rolled back to its savepoint and inserted row by row, to learn which rows were
// new (duplicates only follow redeliveries, so the fast path is the rule).
// @libsql/client prepares every statement on each call; it is the fallback for a remote
// libSQL server (DATABASE_URL=libsql://...), where round trips dominate anyway.
import Database from "libsql";
import { createClient, type InArgs } from "@libsql/client";
import type { DeadLetter } from "./refusals";
import { ThreadedWriter } from "./threaded-writer";
import { aggregateRollups, hourlyOf, hourlyUpsertSql, rollupUpsertSql, type RollupDelta } from "./rollups";
import type { PackedReadings } from "../packed-readings";
import { UPSERT_WORKER_STATUS } from "./health";

export interface ReadingWriter {
  /** Writes one batch in one transaction; resolves with the rows that were new. */
  write(rows: PackedReadings, deadLetters: DeadLetter[], seen: Map<string, number>): Promise<PackedReadings>;
  /**
   * Writes the health snapshot (`worker_status`) between batches. Through the writer, so the
   * main thread never waits for SQLite's lock while a batch commits: it would read no messages
   * meanwhile.
   */
  writeStatus(name: string, at: number, statsJson: string): Promise<void>;
  close(): void;
}

export interface WriterOptions {
  url: string;
  /** Under WAL, NORMAL survives a crash of the process (kill -9); FULL also a power cut. */
  synchronous: "NORMAL" | "FULL";
  deadLettersPerReason: number;
}

const INSERT_DEAD_LETTER = "INSERT INTO dead_letters (at, topic, reason, sample) VALUES (?, ?, ?, ?)";
const PRUNE_DEAD_LETTERS = "DELETE FROM dead_letters WHERE reason = ? AND id NOT IN (SELECT id FROM dead_letters WHERE reason = ? ORDER BY id DESC LIMIT ?)";
const TOUCH_DEVICE = "UPDATE devices SET last_seen_at = ? WHERE controller_id = ? AND revoked_at IS NULL";

/** A local file is written on a thread of its own (./writer-thread.ts); a libSQL server by the client. */
export function openReadingWriter(o: WriterOptions): ReadingWriter {
  return o.url.startsWith("file:") ? new ThreadedWriter(o) : new ClientWriter(o);
}

/** The file path in a `file:` URL (file:/abs, file:///abs, file:relative; query dropped). */
export function fileOfUrl(url: string): string {
  let p = url.slice("file:".length).split("?")[0];
  if (p.startsWith("//")) p = p.slice(2);
  return decodeURIComponent(p);
}

const ROWS_PER_INSERT = 50; // 300 parameters; larger statements gain little

const insertManySql = (n: number) =>
  `INSERT INTO readings (probe_id, ts, raw, value, quality, calibration_run_id) VALUES ${Array(n).fill("(?,?,?,?,?,?)").join(",")}
   ON CONFLICT DO NOTHING`;

/** Runs on the writer thread: synchronous, one transaction per call. */
export class NativeWriter {
  private readonly db: Database.Database;
  private readonly inserts = new Map<number, Database.Statement<unknown[]>>();
  private readonly upsert: Database.Statement<unknown[]>;
  private readonly upsertHourly: Database.Statement<unknown[]>;
  private readonly letter: Database.Statement<unknown[]>;
  private readonly prune: Database.Statement<unknown[]>;
  private readonly touch: Database.Statement<unknown[]>;
  private readonly status: Database.Statement<unknown[]>;
  private readonly tx: Record<"begin" | "commit" | "savepoint" | "release" | "rollbackTo", Database.Statement<unknown[]>>;

  constructor(private readonly o: WriterOptions) {
    this.db = new Database(fileOfUrl(o.url), { timeout: 10_000 });
    this.db.exec(`PRAGMA journal_mode=WAL; PRAGMA synchronous=${o.synchronous};`);
    this.upsert = this.db.prepare(rollupUpsertSql(1));
    this.upsertHourly = this.db.prepare(hourlyUpsertSql(1));
    this.letter = this.db.prepare(INSERT_DEAD_LETTER);
    this.prune = this.db.prepare(PRUNE_DEAD_LETTERS);
    this.touch = this.db.prepare(TOUCH_DEVICE);
    this.status = this.db.prepare(UPSERT_WORKER_STATUS);
    this.tx = {
      begin: this.db.prepare("BEGIN IMMEDIATE"),
      commit: this.db.prepare("COMMIT"),
      savepoint: this.db.prepare("SAVEPOINT chunk"),
      release: this.db.prepare("RELEASE chunk"),
      rollbackTo: this.db.prepare("ROLLBACK TO chunk"),
    };
  }

  private insertStatement(n: number): Database.Statement<unknown[]> {
    let stmt = this.inserts.get(n);
    if (!stmt) {
      stmt = this.db.prepare(insertManySql(n));
      this.inserts.set(n, stmt);
    }
    return stmt;
  }

  /**
   * Inserts the rows; returns one flag a row, 1 when it was new (a repeat, stored or earlier in
   * the batch, is not), or null when every row was.
   */
  private insertRows(rows: PackedReadings): Uint8Array | null {
    let isNew: Uint8Array | null = null;
    const args: unknown[] = [];
    for (let from = 0; from < rows.length; from += ROWS_PER_INSERT) {
      const to = Math.min(from + ROWS_PER_INSERT, rows.length);
      args.length = 0;
      for (let i = from; i < to; i++) args.push(rows.probeId(i), rows.ts(i), rows.raw(i), rows.value(i), rows.quality(i), rows.calibrationRunId(i));
      this.tx.savepoint.run();
      if (this.insertStatement(to - from).run(args).changes === to - from) {
        this.tx.release.run(); // the usual case: nothing was a duplicate
        continue;
      }
      this.tx.rollbackTo.run();
      this.tx.release.run();
      isNew ??= new Uint8Array(rows.length).fill(1);
      const one = this.insertStatement(1);
      for (let i = from; i < to; i++) {
        isNew[i] = one.run(rows.probeId(i), rows.ts(i), rows.raw(i), rows.value(i), rows.quality(i), rows.calibrationRunId(i)).changes ? 1 : 0;
      }
    }
    return isNew;
  }

  /** One transaction; returns which rows were new, as `insertRows` does. */
  write(rows: PackedReadings, deadLetters: DeadLetter[], seen: Map<string, number>): Uint8Array | null {
    let isNew: Uint8Array | null;
    this.tx.begin.run();
    try {
      isNew = this.insertRows(rows);
      const minutes = aggregateRollups(rows, isNew);
      for (const d of minutes) this.upsert.run(d.probeId, d.minute, d.min, d.max, d.sum, d.count);
      for (const d of hourlyOf(minutes)) this.upsertHourly.run(d.probeId, d.minute, d.min, d.max, d.sum, d.count);
      for (const d of deadLetters) {
        this.letter.run(d.at, d.topic, d.reason, d.sample);
        this.prune.run(d.reason, d.reason, this.o.deadLettersPerReason);
      }
      for (const [controllerId, at] of seen) this.touch.run(at, controllerId);
      this.tx.commit.run();
    } catch (err) {
      if (this.db.inTransaction) this.db.exec("ROLLBACK");
      throw err;
    }
    return isNew;
  }

  writeStatus(name: string, at: number, statsJson: string): void {
    this.status.run(name, at, statsJson);
  }

  close(): void {
    this.db.close();
  }
}

const CHUNK = 500; // 3,000 parameters a statement, well under SQLite's limit

class ClientWriter implements ReadingWriter {
  private readonly client;

  constructor(private readonly o: WriterOptions) {
    this.client = createClient({ url: o.url, authToken: process.env.DATABASE_AUTH_TOKEN, concurrency: 1, timeout: 10_000 });
  }

  async write(rows: PackedReadings, deadLetters: DeadLetter[], seen: Map<string, number>): Promise<PackedReadings> {
    const byKey = new Map<string, number>(); // probe and ts → the row's index
    for (let i = 0; i < rows.length; i++) {
      const k = `${rows.probeId(i)}:${rows.ts(i)}`;
      if (!byKey.has(k)) byKey.set(k, i); // a repeat inside the batch is a duplicate too
    }
    const unique = [...byKey.values()];
    const isNew = new Uint8Array(rows.length);
    const tx = await this.client.transaction("write");
    try {
      for (let from = 0; from < unique.length; from += CHUNK) {
        const chunk = unique.slice(from, from + CHUNK);
        const args: InArgs = [];
        for (const i of chunk) args.push(rows.probeId(i), rows.ts(i), rows.raw(i), rows.value(i), rows.quality(i), rows.calibrationRunId(i));
        const sql = `INSERT INTO readings (probe_id, ts, raw, value, quality, calibration_run_id) VALUES ${Array(chunk.length).fill("(?,?,?,?,?,?)").join(",")}
          ON CONFLICT DO NOTHING RETURNING probe_id, ts`;
        const rs = await tx.execute({ sql, args });
        for (const row of rs.rows) isNew[byKey.get(`${row[0]}:${row[1]}`)!] = 1;
      }
      const minutes: RollupDelta[] = aggregateRollups(rows, isNew);
      for (const [deltas, upsertSql] of [
        [minutes, rollupUpsertSql],
        [hourlyOf(minutes), hourlyUpsertSql],
      ] as const) {
        for (let i = 0; i < deltas.length; i += CHUNK) {
          const chunk = deltas.slice(i, i + CHUNK);
          const args: InArgs = [];
          for (const d of chunk) args.push(d.probeId, d.minute, d.min, d.max, d.sum, d.count);
          await tx.execute({ sql: upsertSql(chunk.length), args });
        }
      }
      for (const d of deadLetters) {
        await tx.execute({ sql: INSERT_DEAD_LETTER, args: [d.at, d.topic, d.reason, d.sample] });
        await tx.execute({ sql: PRUNE_DEAD_LETTERS, args: [d.reason, d.reason, this.o.deadLettersPerReason] });
      }
      for (const [controllerId, at] of seen) await tx.execute({ sql: TOUCH_DEVICE, args: [at, controllerId] });
      await tx.commit();
    } catch (err) {
      await tx.rollback().catch(() => undefined);
      throw err;
    } finally {
      tx.close();
    }
    return rows.keep(isNew);
  }

  async writeStatus(name: string, at: number, statsJson: string): Promise<void> {
    await this.client.execute({ sql: UPSERT_WORKER_STATUS, args: [name, at, statsJson] });
  }

  close(): void {
    this.client.close();
  }
}
