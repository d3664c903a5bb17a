// The ingest's counters and the once-a-second snapshot in worker_status (read by
// GET /api/ingest/health and by the bench).
import { ingestStats, type IngestStats } from "../payloads";
import type { PackedReadings } from "../packed-readings";

export class IngestMetrics {
  readonly startedAt = Date.now();
  readingsTotal = 0;
  messagesTotal = 0;
  duplicatesTotal = 0;
  seqGaps = 0;
  hookErrors = 0;
  flushCount = 0;
  lastFlushMs: number | null = null;
  lastFlushRows = 0;
  retention = { lastRunAt: null as number | null, deleted: 0 };

  private windowStart = Date.now();
  private windowRows = 0;
  private windowLagSum = 0;
  private windowLagMax: number | null = null;

  /** After a commit: `inserted` new rows out of `received` samples, committed at `at`. */
  recordCommit(inserted: PackedReadings, received: number, at: number, flushMs: number): void {
    this.flushCount++;
    this.lastFlushMs = flushMs;
    this.lastFlushRows = received;
    this.readingsTotal += inserted.length;
    this.duplicatesTotal += received - inserted.length;
    this.windowRows += inserted.length;
    for (let i = 0; i < inserted.length; i++) {
      const lag = at - inserted.ts(i);
      this.windowLagSum += lag;
      if (this.windowLagMax === null || lag > this.windowLagMax) this.windowLagMax = lag;
    }
  }

  /** The snapshot for worker_status; starts a new rate window. */
  snapshot(now: number, live: Pick<IngestStats, "mqttConnected" | "queueDepth" | "refusals" | "refusalsTotal">): IngestStats {
    const seconds = Math.max(0.001, (now - this.windowStart) / 1000);
    const stats: IngestStats = {
      v: 1,
      pid: process.pid,
      startedAt: this.startedAt,
      ...live,
      readingsPerS: Math.round((this.windowRows / seconds) * 10) / 10,
      readingsTotal: this.readingsTotal,
      messagesTotal: this.messagesTotal,
      duplicatesTotal: this.duplicatesTotal,
      lagMs: {
        mean: this.windowRows ? Math.round(this.windowLagSum / this.windowRows) : null,
        max: this.windowLagMax,
      },
      seqGaps: this.seqGaps,
      flush: { count: this.flushCount, lastMs: this.lastFlushMs, lastRows: this.lastFlushRows },
      hookErrors: this.hookErrors,
      retention: { ...this.retention },
      rssMb: Math.round((process.memoryUsage().rss / 1048576) * 10) / 10,
    };
    this.windowStart = now;
    this.windowRows = 0;
    this.windowLagSum = 0;
    this.windowLagMax = null;
    return ingestStats.parse(stats);
  }
}

/** The snapshot's row: name, updated_at, stats (JSON). The writer runs it (./batch-writer.ts). */
export const UPSERT_WORKER_STATUS = `INSERT INTO worker_status (name, updated_at, stats) VALUES (?, ?, ?)
  ON CONFLICT(name) DO UPDATE SET updated_at = excluded.updated_at, stats = excluded.stats`;
