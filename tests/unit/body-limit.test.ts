// Request bodies are capped while they stream, declared length or not.
import { describe, expect, it } from "vitest";
import { ApiError } from "@/app/_server/errors";
import { MAX_JSON_BODY_BYTES, readBodyCapped } from "@/app/_server/body-limit";

/** A body of `chunks` × `size` bytes with no Content-Length; counts how many chunks were pulled. */
function streamedRequest(chunks: number, size: number) {
  let pulled = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (pulled === chunks) return controller.close();
      pulled++;
      controller.enqueue(new Uint8Array(size).fill(0x20));
    },
  });
  const req = new Request("http://x/api", { method: "POST", body, duplex: "half" } as RequestInit);
  return { req, pulled: () => pulled };
}

async function refusal(p: Promise<unknown>): Promise<ApiError> {
  const e = await p.then(() => null, (err: unknown) => err);
  if (e instanceof ApiError) return e;
  throw new Error(`expected a refusal, got ${String(e)}`);
}

describe("capped request bodies", () => {
  it("reads a body within the cap", async () => {
    const { req } = streamedRequest(4, 1024);
    expect((await readBodyCapped(req, MAX_JSON_BODY_BYTES)).byteLength).toBe(4096);
  });

  it("refuses a declared length above the cap without reading", async () => {
    const req = new Request("http://x/api", { method: "POST", body: "x".repeat(10), headers: { "content-length": String(MAX_JSON_BODY_BYTES + 1) } });
    const e = await refusal(readBodyCapped(req, MAX_JSON_BODY_BYTES));
    expect([e.status, e.code]).toEqual([413, "too_large"]);
    expect(e.message).toMatch(/larger than 64 KiB/);
  });

  it("stops an undeclared (chunked) body as soon as it passes the cap", async () => {
    // 60 MB offered in 64 KiB chunks: refused after the second chunk, the rest never read.
    const { req, pulled } = streamedRequest(960, 64 * 1024);
    const e = await refusal(readBodyCapped(req, MAX_JSON_BODY_BYTES));
    expect(e.status).toBe(413);
    expect(pulled()).toBeLessThanOrEqual(3);
  });
});
