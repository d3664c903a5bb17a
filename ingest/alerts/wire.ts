// How the ingest process runs the alert runner: feed it every committed batch and tick it
// every 30 s. Failures are logged, never thrown into the ingest's write path.
import type { Db } from "../../db/client";
import { createAlertRunner, type AlertRunnerOptions } from "./runner";
import type { PackedReadings } from "../packed-readings";
import type { Publish } from "./publish";

export const TICK_EVERY_MS = 30_000;

/** ALERTS_TICK_MS and ALERTS_RESOLVE_AFTER_MS shorten the cadence for end-to-end tests. */
export function fromEnv(name: string): number | undefined {
  const v = Number(process.env[name]);
  return Number.isInteger(v) && v > 0 ? v : undefined;
}

export interface AlertsHandle {
  /** Hand it each batch once it is committed to `readings`. Never rejects. */
  onReadingsCommitted(readings: PackedReadings): Promise<void>;
  /** Stops the 30 s tick (call on shutdown). */
  stop(): void;
}

export function startAlerts(o: { db: Db; publish: Publish } & Partial<AlertRunnerOptions>): AlertsHandle {
  const runner = createAlertRunner({ resolveAfterMs: fromEnv("ALERTS_RESOLVE_AFTER_MS"), ...o });
  const log = (what: string, err: unknown) => console.error(`[alerts] ${what} failed`, err);
  const timer = setInterval(() => runner.tick().catch((err) => log("tick", err)), fromEnv("ALERTS_TICK_MS") ?? TICK_EVERY_MS);
  timer.unref();
  void runner.tick().catch((err) => log("first tick", err));
  return {
    onReadingsCommitted: (readings) => runner.onReadings(readings).catch((err) => log("evaluating a batch", err)),
    stop: () => clearInterval(timer),
  };
}
