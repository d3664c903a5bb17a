// The ingest's hand-checked validation gives the same verdicts as the zod schema of a raw
// message (ingest/payloads.ts), on good messages, on every kind of bad envelope and bad sample.
import { describe, expect, it } from "vitest";
import { rawMessage } from "../../ingest/payloads";
import { decodeRaw } from "../../ingest/worker/decode";

/** The full zod schema's verdict. */
const decodeRawWithZod = (json: unknown) => {
  const parsed = rawMessage.safeParse(json);
  return parsed.success ? parsed.data : null;
};

const good = { serial: "PH-24-0101", ts: 1767225600000, signal: 54.06 };
const bytes = (v: unknown) => new TextEncoder().encode(typeof v === "string" ? v : JSON.stringify(v));

const badSamples: [string, unknown][] = [
  ["not an object", 5],
  ["null", null],
  ["an array", [good]],
  ["no serial", { ts: good.ts, signal: 1 }],
  ["empty serial", { ...good, serial: "" }],
  ["serial too long", { ...good, serial: "x".repeat(65) }],
  ["serial a number", { ...good, serial: 12 }],
  ["fractional ts", { ...good, ts: 1.5 }],
  ["zero ts", { ...good, ts: 0 }],
  ["negative ts", { ...good, ts: -1 }],
  ["unsafe ts", { ...good, ts: 2 ** 60 }],
  ["ts a string", { ...good, ts: "1767225600000" }],
  ["signal too low", { ...good, signal: -5000.01 }],
  ["signal too high", { ...good, signal: 1_000_001 }],
  ["signal a string", { ...good, signal: "54" }],
  ["signal missing", { serial: good.serial, ts: good.ts }],
];

describe("decodeRaw", () => {
  it("accepts the envelope's edge values as the schema does", () => {
    for (const message of [{ v: 1, seq: 0, samples: [good] }, { v: 1, seq: Number.MAX_SAFE_INTEGER, samples: Array(500).fill(good) }]) {
      expect(decodeRaw(bytes(message))).toEqual({ ok: true, message: decodeRawWithZod(message) });
    }
  });

  it("accepts what the schema accepts, keeping only the known fields", () => {
    const message = { v: 1, seq: 7, extra: true, samples: [good, { ...good, serial: "x".repeat(64), signal: -5000, extra: 1 }, { ...good, signal: 1_000_000 }] };
    const decoded = decodeRaw(bytes(message));
    expect(decoded).toEqual({ ok: true, message: decodeRawWithZod(message) });
  });

  it.each(badSamples)("refuses the whole message for a sample with %s, as the schema does", (_what, sample) => {
    const message = { v: 1, seq: 1, samples: [good, sample] };
    expect(decodeRawWithZod(message)).toBeNull();
    expect(decodeRaw(bytes(message))).toEqual({ ok: false, reason: "invalid-schema" });
  });

  it("refuses bad envelopes, bad JSON and oversize payloads with their reasons", () => {
    const badEnvelopes: unknown[] = [
      { v: 2, seq: 1, samples: [good] },
      { v: "1", seq: 1, samples: [good] },
      { seq: 1, samples: [good] },
      { v: 1, seq: -1, samples: [good] },
      { v: 1, seq: 1.5, samples: [good] },
      { v: 1, seq: 2 ** 60, samples: [good] },
      { v: 1, seq: "1", samples: [good] },
      { v: 1, samples: [good] },
      { v: 1, seq: 1, samples: [] },
      { v: 1, seq: 1, samples: Array(501).fill(good) },
      { v: 1, seq: 1, samples: { 0: good } },
      { v: 1, seq: 1 },
      [{ v: 1, seq: 1, samples: [good] }],
      null,
      7,
      true,
    ];
    for (const message of badEnvelopes) {
      expect(decodeRawWithZod(message)).toBeNull();
      expect(decodeRaw(bytes(message))).toEqual({ ok: false, reason: "invalid-schema" });
    }
    expect(decodeRaw(bytes("{not json"))).toEqual({ ok: false, reason: "invalid-json" });
    expect(decodeRaw(new Uint8Array([0xff, 0xfe]))).toEqual({ ok: false, reason: "invalid-json" });
    expect(decodeRaw(bytes({ v: 1, seq: 1, samples: [good] }), 10)).toEqual({ ok: false, reason: "oversize" });
  });
});
