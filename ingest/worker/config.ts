// The ingest worker's settings, from the environment (validated once at start).
import { z } from "zod";

const schema = z.object({
  INGEST_WORKER_NAME: z.string().min(1).default("ingest"),
  /**
   * Set to run this worker as one of several in an MQTT 5 shared subscription
   * ($share/{group}/tw/v1/dev/+/raw) on an external broker (Mosquitto). Each worker needs its
   * own INGEST_WORKER_NAME: it names its persistent session and its health snapshot.
   */
  INGEST_SHARED_GROUP: z
    .string()
    .regex(/^[A-Za-z0-9_-]{1,64}$/, "letters, digits, _ and - only")
    .optional(),
  /** How long the broker keeps a shared worker's session (and queues its share) while it is away. */
  INGEST_SESSION_EXPIRY_S: z.coerce.number().int().positive().default(7 * 86_400),
  /** A batch is committed at the latest this long after its first message arrived. */
  INGEST_FLUSH_MS: z.coerce.number().int().positive().default(50),
  /** ...or as soon as it holds this many rows: a cap; batches are sized by time, so fewer, larger transactions at high rates. */
  INGEST_BATCH_ROWS: z.coerce.number().int().positive().default(10_000),
  /** Above this many uncommitted rows the worker stops reading from the broker (backpressure). */
  INGEST_MAX_PENDING_ROWS: z.coerce.number().int().positive().default(40_000),
  INGEST_HEALTH_MS: z.coerce.number().int().positive().default(1000),
  /** How often calibrations, holds and the probe registry are re-read (events also refresh them). */
  INGEST_REFRESH_MS: z.coerce.number().int().positive().default(2000),
  /** SQLite `synchronous` for the writer: NORMAL survives process crashes, FULL also power cuts. */
  INGEST_SQLITE_SYNCHRONOUS: z.enum(["NORMAL", "FULL"]).default("NORMAL"),
  INGEST_DEAD_LETTERS_PER_REASON: z.coerce.number().int().positive().default(20),
  RAW_RETENTION_DAYS: z.coerce.number().positive().default(30),
  RETENTION_INTERVAL_MS: z.coerce.number().int().positive().default(3_600_000),
  RETENTION_FIRST_RUN_MS: z.coerce.number().int().nonnegative().default(60_000),
});

export type IngestConfig = {
  workerName: string;
  sharedGroup: string | null;
  sessionExpirySeconds: number;
  flushMs: number;
  batchRows: number;
  maxPendingRows: number;
  healthMs: number;
  refreshMs: number;
  deadLettersPerReason: number;
  synchronous: "NORMAL" | "FULL";
  retentionDays: number;
  retentionIntervalMs: number;
  retentionFirstRunMs: number;
};

export function ingestConfig(env: NodeJS.ProcessEnv = process.env): IngestConfig {
  const e = schema.parse(env);
  return {
    workerName: e.INGEST_WORKER_NAME,
    sharedGroup: e.INGEST_SHARED_GROUP ?? null,
    sessionExpirySeconds: e.INGEST_SESSION_EXPIRY_S,
    flushMs: e.INGEST_FLUSH_MS,
    batchRows: e.INGEST_BATCH_ROWS,
    maxPendingRows: e.INGEST_MAX_PENDING_ROWS,
    healthMs: e.INGEST_HEALTH_MS,
    refreshMs: e.INGEST_REFRESH_MS,
    deadLettersPerReason: e.INGEST_DEAD_LETTERS_PER_REASON,
    synchronous: e.INGEST_SQLITE_SYNCHRONOUS,
    retentionDays: e.RAW_RETENTION_DAYS,
    retentionIntervalMs: e.RETENTION_INTERVAL_MS,
    retentionFirstRunMs: e.RETENTION_FIRST_RUN_MS,
  };
}
