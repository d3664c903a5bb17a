// The SQLite ceiling: the same rows as the ingest stores, inserted plainly with the same
// statements and batches (50-row INSERTs prepared once, one transaction per 500 rows) into a
// copy of the same database, with nothing else going on: what the disk path alone allows.
import Database from "libsql";

const ROWS_PER_INSERT = 50;

export function measureInsertCeiling(file: string, probeIds: number[], rows: number, batch = 500, daysAhead = 1): number {
  const db = new Database(file, { timeout: 10_000 });
  db.exec("PRAGMA journal_mode=WAL; PRAGMA synchronous=NORMAL;");
  const insert = db.prepare(
    `INSERT INTO readings (probe_id, ts, raw, value, quality, calibration_run_id) VALUES ${Array(ROWS_PER_INSERT).fill("(?,?,?,?,?,?)").join(",")} ON CONFLICT DO NOTHING`,
  );
  const begin = db.prepare("BEGIN IMMEDIATE");
  const commit = db.prepare("COMMIT");
  let ts = Date.now() + daysAhead * 86_400_000; // clear of the rows already there (and of other repeats)
  let n = 0;
  const started = performance.now();
  while (n < rows) {
    begin.run();
    for (let i = 0; i < batch; i += ROWS_PER_INSERT) {
      const args: unknown[] = [];
      for (let k = 0; k < ROWS_PER_INSERT; k++, n++) {
        if (n % probeIds.length === 0) ts++;
        args.push(probeIds[n % probeIds.length], ts, 40, 6.2, "ok", null);
      }
      insert.run(args);
    }
    commit.run();
  }
  const seconds = (performance.now() - started) / 1000;
  db.close();
  return n / seconds;
}

/**
 * The ceiling timed three times, each on rows of its own: one timing of a second or two swings by
 * a fifth either way with the disk's write-back, so the bench takes the median.
 */
export function medianInsertCeiling(file: string, probeIds: number[], rows: number): { median: number; runs: number[] } {
  const runs = [1, 2, 3].map((day) => measureInsertCeiling(file, probeIds, rows, 500, day));
  return { median: [...runs].sort((a, b) => a - b)[1], runs };
}
