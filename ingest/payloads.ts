// zod schemas of every MQTT payload, version 1. The ingest refuses anything that does not parse.
import { z } from "zod";

const MAX_FUTURE_MS = 5 * 60_000;

export const rawSample = z.object({
  serial: z.string().min(1).max(64),
  ts: z.number().int().positive(), // ms epoch, set by the device
  // pH: electrode mV; EC: conductance µS; temp: °C
  signal: z.number().finite().gte(-5000).lte(1_000_000),
});

export const rawMessage = z.object({
  v: z.literal(1),
  seq: z.number().int().nonnegative(),
  samples: z.array(rawSample).min(1).max(500),
});
export type RawMessage = z.infer<typeof rawMessage>;

export function isFuture(ts: number, now = Date.now()) {
  return ts > now + MAX_FUTURE_MS;
}

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

export const readingBatch = z.object({ v: z.literal(1), readings: z.array(calibratedReading) });

export const dosingCommand = z.object({
  v: z.literal(1),
  inhibit: z.boolean(),
  holdId: z.number().int().nullable(),
  until: z.number().int().nullable(),
  reason: z.string().max(500).nullable(),
  at: z.number().int(),
});
export type DosingCommand = z.infer<typeof dosingCommand>;

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

export const simControl = z.object({
  v: z.literal(1),
  fault: z.enum(["none", "stuck", "out-of-solution", "spike", "fast-drift", "offline", "out-of-band"]).optional(),
  measure: z.enum(["ph", "ec", "temp"]).optional(),
  // While a tank is held its probe can be placed in a buffer or standard.
  placeIn: z
    .union([z.object({ kind: z.literal("ph-buffer"), buffer: z.string() }), z.object({ kind: z.literal("ec-standard"), ec25UsPerCm: z.number().positive() }), z.literal("tank")])
    .optional(),
});
export type SimControl = z.infer<typeof simControl>;
