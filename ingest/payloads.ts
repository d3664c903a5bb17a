// zod schemas of every MQTT payload, version 1. The ingest refuses anything that does not parse.
// Payloads are UTF-8 JSON objects carrying `v: 1`; a later incompatible version gets a new topic root.
import { z } from "zod";

const MAX_FUTURE_MS = 5 * 60_000;

/** Largest raw payload the ingest parses; anything bigger is refused as "oversize" unread. */
export const MAX_RAW_PAYLOAD_BYTES = 64 * 1024;

/** One probe sample as the device measured it. */
export const rawSample = z.object({
  serial: z.string().min(1).max(64),
  ts: z.number().int().positive(), // ms epoch, set by the device
  // pH: electrode mV; EC: conductance µS; temp: °C
  signal: z.number().finite().gte(-5000).lte(1_000_000),
});
export type RawSample = z.infer<typeof rawSample>;

/**
 * tw/v1/dev/{controllerId}/raw, QoS 1: one message per tick per controller carrying its
 * samples (pH, EC and temperature: three for a tank). `seq` counts the device's messages
 * (per connection, from 0) so the ingest can tell lost messages from a quiet device.
 */
export const rawMessage = z.object({
  v: z.literal(1),
  seq: z.number().int().nonnegative(),
  samples: z.array(rawSample).min(1).max(500),
});
export type RawMessage = z.infer<typeof rawMessage>;

/** A device clock more than five minutes ahead is wrong: such samples are refused. */
export function isFuture(ts: number, now = Date.now()) {
  return ts > now + MAX_FUTURE_MS;
}

/** One corrected reading, as stored and as streamed. `value`: pH, EC25 in µS/cm, or °C. */
export const calibratedReading = z.object({
  v: z.literal(1),
  orgId: z.number().int(),
  tankId: z.number().int(),
  probeId: z.number().int(),
  kind: z.enum(["ph", "ec", "temp"]),
  ts: z.number().int(),
  raw: z.number(),
  value: z.number().nullable(),
  quality: z.enum(["ok", "held", "uncalibrated", "lapsed", "suspect"]),
});
export type CalibratedReading = z.infer<typeof calibratedReading>;

/** tw/v1/org/{orgId}/tank/{tankId}/reading, QoS 0: readings of one tank committed in one batch. */
export const readingBatch = z.object({ v: z.literal(1), readings: z.array(calibratedReading) });
export type ReadingBatch = z.infer<typeof readingBatch>;

/** tw/v1/dev/{controllerId}/cmd/dosing, QoS 1, retained: the controller's dosing inhibit. */
export const dosingCommand = z.object({
  v: z.literal(1),
  inhibit: z.boolean(),
  holdId: z.number().int().nullable(),
  until: z.number().int().nullable(),
  reason: z.string().max(500).nullable(),
  at: z.number().int(),
});
export type DosingCommand = z.infer<typeof dosingCommand>;

/** tw/v1/org/{orgId}/event: something changed; listeners re-read the database. */
export const orgEvent = z.object({
  v: z.literal(1),
  type: z.enum(["incident.opened", "incident.updated", "incident.resolved", "hold.placed", "hold.released", "calibration.saved"]),
  orgId: z.number().int(),
  tankId: z.number().int().nullable(),
  id: z.number().int().nullable(),
  at: z.number().int(),
  summary: z.string().max(500),
});
export type OrgEvent = z.infer<typeof orgEvent>;

/** The simulator's fault causes (see scripts/simulator/faults.ts for what each does). */
export const SIM_FAULTS = ["none", "stuck", "out-of-solution", "spike", "fast-drift", "offline", "out-of-band"] as const;
export type SimFault = (typeof SIM_FAULTS)[number];

/**
 * tw/v1/sim/{controllerId}/control, QoS 1: faults on demand and, while the tank is held
 * (dosing inhibited), placing its probe in a buffer or EC standard. `measure` narrows a
 * fault to one probe; without it the fault applies to the tank's probes as the cause implies.
 */
export const simControl = z.object({
  v: z.literal(1),
  fault: z.enum(SIM_FAULTS).optional(),
  measure: z.enum(["ph", "ec", "temp"]).optional(),
  // While a tank is held its probe can be placed in a buffer or standard.
  placeIn: z
    .union([z.object({ kind: z.literal("ph-buffer"), buffer: z.string() }), z.object({ kind: z.literal("ec-standard"), ec25UsPerCm: z.number().positive() }), z.literal("tank")])
    .optional(),
});
export type SimControl = z.infer<typeof simControl>;

/** Why the ingest refused a raw message or one of its samples (counted per reason). */
export const REFUSAL_REASONS = [
  "oversize", // payload above MAX_RAW_PAYLOAD_BYTES, not parsed
  "invalid-json", // not UTF-8 JSON
  "invalid-schema", // JSON that is not a rawMessage
  "unknown-probe", // no probe has this serial
  "probe-not-on-this-controller", // the probe belongs to another controller's tank
  "retired-probe", // the probe was retired before the sample's timestamp
  "future-timestamp", // more than five minutes ahead of the ingest's clock
  "expired-timestamp", // older than the raw retention: it would be deleted at once
  "unknown-controller", // no tank or device has the topic's controller id
] as const;
export type RefusalReason = (typeof REFUSAL_REASONS)[number];

/** The ingest's health snapshot in worker_status.stats (written every second). */
export const ingestStats = z.object({
  v: z.literal(1),
  pid: z.number().int(),
  startedAt: z.number().int(),
  mqttConnected: z.boolean(),
  /** New rows committed per second over the last snapshot interval. */
  readingsPerS: z.number(),
  readingsTotal: z.number().int(),
  messagesTotal: z.number().int(),
  /** Samples already stored (same probe and ts): QoS 1 redeliveries, device resends. */
  duplicatesTotal: z.number().int(),
  /** Device timestamp to commit, over the rows of the last interval (null when none). */
  lagMs: z.object({ mean: z.number().nullable(), max: z.number().nullable() }),
  /** Refused messages (message-level reasons) or samples (sample-level reasons) since start. */
  refusals: z.record(z.string(), z.number().int()),
  refusalsTotal: z.number().int(),
  /** Samples and messages received but not yet committed and acknowledged. */
  queueDepth: z.object({ samples: z.number().int(), messages: z.number().int() }),
  /** Messages missing by device sequence number (gaps in `seq`) since start; approximate when messages are redelivered out of order. */
  seqGaps: z.number().int(),
  flush: z.object({ count: z.number().int(), lastMs: z.number().nullable(), lastRows: z.number().int() }),
  hookErrors: z.number().int(),
  retention: z.object({ lastRunAt: z.number().int().nullable(), deleted: z.number().int() }),
  rssMb: z.number(),
});
export type IngestStats = z.infer<typeof ingestStats>;
