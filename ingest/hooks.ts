// Extension points of the ingest worker.
//
// createHooks is called once at start with what a plug-in needs (the database and a way to
// publish on the broker as svc-ingest). Its onReadingsCommitted is called once per committed
// batch with the rows that were new (never duplicates, packed: ./packed-readings.ts), in commit
// order, one call at a time:
// the next batch's call waits for this one, so an implementation can keep per-probe state
// without locking. It runs after the batch's MQTT acknowledgements went out; an error is logged
// and counted (hookErrors in the health snapshot), never retried. `stop` runs on shutdown.
//
// The alert engine (ingest/alerts) is the plug-in: every committed batch goes through the rules,
// on a thread of the ingest's own so they do not compete with reading the broker.
// When several workers share the broker subscription (`electedAs` set), one of them, elected by
// a lease, runs the alerts over every worker's committed rows instead (ingest/alerts/elected.ts).
import type { Db } from "../db/client";
import { startElectedAlerts } from "./alerts/elected";
import { startThreadedHooks } from "./alerts/threaded";
import { fromEnv, startAlerts } from "./alerts/wire";
import type { CalibratedReading } from "./payloads";
import type { PackedReadings } from "./packed-readings";

export interface CommittedReading extends CalibratedReading {
  calibrationRunId: number | null;
}

export interface HookContext {
  db: Db;
  /** Publishes as svc-ingest (QoS 1 resolves on the broker's PUBACK; queued while offline). */
  publish(topic: string, payload: string, opts: { qos: 0 | 1; retain: boolean }): Promise<unknown>;
  /** Set when this is one of several workers: the unique name this process competes for the alert lease with. */
  electedAs?: string;
}

export interface IngestHooks {
  onReadingsCommitted(readings: PackedReadings): void | Promise<void>;
  stop?(): void;
}

export type HooksFactory = (ctx: HookContext) => IngestHooks;

/** The ingest's hooks: the alert engine, on a thread of its own (./alerts/threaded.ts). */
export const createHooks: HooksFactory = (ctx) => startThreadedHooks(ctx);

/** The same hooks run where they are called (the alert thread runs these). */
export const createInPlaceHooks: HooksFactory = (ctx) =>
  ctx.electedAs
    ? startElectedAlerts({
        db: ctx.db,
        publish: ctx.publish,
        holder: ctx.electedAs,
        leaseMs: fromEnv("ALERTS_LEASE_MS"),
        tickMs: fromEnv("ALERTS_TICK_MS"),
        resolveAfterMs: fromEnv("ALERTS_RESOLVE_AFTER_MS"),
      })
    : startAlerts(ctx);
