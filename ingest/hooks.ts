// Extension points of the ingest worker.
//
// createHooks is called once at start with what a plug-in needs (the database and a way to
// publish on the broker as svc-ingest). Its onReadingsCommitted is called once per committed
// batch with the rows that were new (never duplicates), in commit order, one call at a time:
// the next batch's call waits for this one, so an implementation can keep per-probe state
// without locking. It runs after the batch's MQTT acknowledgements went out; an error is logged
// and counted (hookErrors in the health snapshot), never retried. `stop` runs on shutdown.
//
// The alert engine (ingest/alerts) is the plug-in: every committed batch goes through the rules.
import type { Db } from "../db/client";
import { startAlerts } from "./alerts/wire";
import type { CalibratedReading } from "./payloads";

export interface CommittedReading extends CalibratedReading {
  calibrationRunId: number | null;
}

export interface HookContext {
  db: Db;
  /** Publishes as svc-ingest (QoS 1 resolves on the broker's PUBACK; queued while offline). */
  publish(topic: string, payload: string, opts: { qos: 0 | 1; retain: boolean }): Promise<unknown>;
}

export interface IngestHooks {
  onReadingsCommitted(readings: readonly CommittedReading[]): void | Promise<void>;
  stop?(): void;
}

export type HooksFactory = (ctx: HookContext) => IngestHooks;

export const createHooks: HooksFactory = (ctx) => startAlerts(ctx);
