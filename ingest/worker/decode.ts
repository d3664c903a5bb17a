// Message-level checks of a raw payload: size, JSON, schema. Pure.
//
// This runs for every message at full rate, so the samples (up to 500 a message) are checked by
// hand against exactly the rules of `rawSample` in ../payloads.ts, and only the small envelope
// goes through zod: zod's per-sample object parsing was the largest share of decoding in the
// profile. A message with any sample that breaks a rule is refused as a whole ("invalid-schema"),
// as before; tests/unit/ingest-decode.test.ts holds the two checks to the same verdicts.
import { z } from "zod";
import { MAX_RAW_PAYLOAD_BYTES, type RawMessage, type RawSample, type RefusalReason } from "../payloads";

export type Decoded = { ok: true; message: RawMessage } | { ok: false; reason: RefusalReason };

const utf8 = new TextDecoder("utf-8", { fatal: true });

const envelope = z.object({
  v: z.literal(1),
  seq: z.number().int().nonnegative(),
  samples: z.array(z.unknown()).min(1).max(500),
});

/** The sample with only its known fields, or null when it breaks a rule of `rawSample`. */
export function checkSample(s: unknown): RawSample | null {
  if (typeof s !== "object" || s === null || Array.isArray(s)) return null;
  const { serial, ts, signal } = s as Record<string, unknown>;
  if (typeof serial !== "string" || serial.length < 1 || serial.length > 64) return null;
  if (typeof ts !== "number" || !Number.isSafeInteger(ts) || ts <= 0) return null;
  if (typeof signal !== "number" || !Number.isFinite(signal) || signal < -5000 || signal > 1_000_000) return null;
  return { serial, ts, signal };
}

export function decodeRaw(payload: Uint8Array, maxBytes = MAX_RAW_PAYLOAD_BYTES): Decoded {
  // Checked before parsing, so a huge payload costs nothing but this comparison.
  if (payload.length > maxBytes) return { ok: false, reason: "oversize" };
  let json: unknown;
  try {
    json = JSON.parse(utf8.decode(payload));
  } catch {
    return { ok: false, reason: "invalid-json" };
  }
  const head = envelope.safeParse(json);
  if (!head.success) return { ok: false, reason: "invalid-schema" };
  const samples: RawSample[] = [];
  for (const raw of head.data.samples) {
    const s = checkSample(raw);
    if (!s) return { ok: false, reason: "invalid-schema" };
    samples.push(s);
  }
  return { ok: true, message: { v: 1, seq: head.data.seq, samples } };
}

