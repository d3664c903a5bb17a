// The SQLite ceiling: the same rows as the ingest stores, inserted plainly with the same
// statements (50-row INSERTs prepared once) into a copy of the same database, with nothing else
// going on: what the disk path alone allows. The bench times it with one transaction per 500 rows
// (the ingest's batch before it batched by time, and the figure the ratio is taken against) and
// again with the ingest's own mean batch of the run, larger transactions that SQLite writes faster.
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
export function medianInsertCeiling(file: string, probeIds: number[], rows: number, batch = 500, firstDay = 1): { median: number; runs: number[] } {
  const runs = [0, 1, 2].map((k) => measureInsertCeiling(file, probeIds, rows, batch, firstDay + k));
  return { median: [...runs].sort((a, b) => a - b)[1], runs };
}
