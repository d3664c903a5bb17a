// Message-level checks of a raw payload: size, JSON, schema. Pure.
//
// This runs for every message at full rate, so the message is checked by hand against exactly
// the rules of `rawMessage` and `rawSample` in ../payloads.ts (the schemas the rest of the code and
// the documentation use): zod's parsing, which copies every object and array it checks, was the
// largest share of decoding in the profile. A message with any sample that breaks a rule is
// refused as a whole ("invalid-schema"); tests/unit/ingest-decode.test.ts holds the hand check
// and zod to the same verdicts.
import { MAX_RAW_PAYLOAD_BYTES, type RawMessage, type RawSample, type RefusalReason } from "../payloads";

export type Decoded = { ok: true; message: RawMessage } | { ok: false; reason: RefusalReason };

const utf8 = new TextDecoder("utf-8", { fatal: true });

const MAX_SAMPLES = 500;

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
  if (typeof json !== "object" || json === null || Array.isArray(json)) return { ok: false, reason: "invalid-schema" };
  const { v, seq, samples: list } = json as Record<string, unknown>;
  if (v !== 1 || typeof seq !== "number" || !Number.isSafeInteger(seq) || seq < 0) return { ok: false, reason: "invalid-schema" };
  if (!Array.isArray(list) || list.length < 1 || list.length > MAX_SAMPLES) return { ok: false, reason: "invalid-schema" };
  const samples: RawSample[] = [];
  for (const raw of list) {
    const s = checkSample(raw);
    if (!s) return { ok: false, reason: "invalid-schema" };
    samples.push(s);
  }
  return { ok: true, message: { v: 1, seq, samples } };
}

