// Message-level checks of a raw payload: size, JSON, schema. Pure.
import { MAX_RAW_PAYLOAD_BYTES, rawMessage, type RawMessage, type RefusalReason } from "../payloads";

export type Decoded = { ok: true; message: RawMessage } | { ok: false; reason: RefusalReason };

const utf8 = new TextDecoder("utf-8", { fatal: true });

export function decodeRaw(payload: Uint8Array, maxBytes = MAX_RAW_PAYLOAD_BYTES): Decoded {
  // Checked before parsing, so a huge payload costs nothing but this comparison.
  if (payload.length > maxBytes) return { ok: false, reason: "oversize" };
  let json: unknown;
  try {
    json = JSON.parse(utf8.decode(payload));
  } catch {
    return { ok: false, reason: "invalid-json" };
  }
  const parsed = rawMessage.safeParse(json);
  return parsed.success ? { ok: true, message: parsed.data } : { ok: false, reason: "invalid-schema" };
}
