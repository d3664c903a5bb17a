// What the ingest's main thread and its alert thread say to each other. Readings cross packed
// (../packed-readings.ts); the thread's MQTT publishes go back to the main thread, which holds the
// broker connection.
import type { PublishOptions } from "./publish";

export type ToAlertThread =
  | { kind: "readings"; id: number; rows: Float64Array }
  | { kind: "published"; id: number; error: string | null }
  | { kind: "stop" };

export type FromAlertThread = { kind: "done"; id: number } | { kind: "publish"; id: number; topic: string; payload: string; opts: PublishOptions };
