// Bodies are capped while they stream: a huge JSON body or upload, with or without a declared
// length, is answered 413 with a clear error and never read whole.
import http from "node:http";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { sessionFor, type HttpSession } from "./session";

interface Answer {
  status: number;
  body: { error?: { code: string; message: string } };
  sentBytes: number;
}

/**
 * Streams `totalBytes` to `pathname` in chunks with no Content-Length (chunked), stopping as soon
 * as the server answers. `head` and `tail` wrap the filler (e.g. multipart boundaries).
 */
function streamChunked(baseURL: string, pathname: string, o: { cookie: string; contentType: string; head: string; filler: number; totalBytes: number }): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const url = new URL(pathname, baseURL);
    let sentBytes = 0;
    let answered = false;
    const req = http.request(url, { method: "POST", headers: { cookie: o.cookie, "content-type": o.contentType, "transfer-encoding": "chunked", origin: baseURL } }, (res) => {
      answered = true;
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (text += c));
      res.on("end", () => {
        req.destroy();
        resolve({ status: res.statusCode ?? 0, body: text ? JSON.parse(text) : {}, sentBytes });
      });
    });
    req.on("error", (err) => (answered ? undefined : reject(err)));
    const chunk = Buffer.alloc(64 * 1024, o.filler);
    req.write(o.head);
    const pump = () => {
      while (!answered && sentBytes < o.totalBytes) {
        sentBytes += chunk.length;
        if (!req.write(chunk)) return void req.once("drain", pump);
      }
      if (!answered) req.end();
    };
    pump();
  });
}

describe("request limits", () => {
  const baseURL = inject("baseURL");
  let grower: HttpSession;
  beforeAll(async () => {
    grower = await sessionFor(baseURL, "grower");
  });

  it("refuses a JSON body above 64 KiB, declared or streamed, with 413", async () => {
    const declared = await grower.fetch("/api/settings/preferences", {
      method: "PATCH",
      headers: { "content-type": "application/json", origin: baseURL },
      body: JSON.stringify({ ecUnit: "mS/cm", note: "x".repeat(100 * 1024) }),
    });
    expect(declared.status).toBe(413);
    expect(((await declared.json()) as Answer["body"]).error).toMatchObject({ code: "too_large", message: expect.stringMatching(/larger than 64 KiB/) });

    // 60 MB of a note with no declared length: answered long before it is all sent.
    const streamed = await streamChunked(baseURL, "/api/holds", {
      cookie: grower.cookieHeader(),
      contentType: "application/json",
      head: '{"reason":"',
      filler: 0x61,
      totalBytes: 60 * 1024 * 1024,
    });
    expect(streamed.status).toBe(413);
    expect(streamed.body.error?.code).toBe("too_large");
    expect(streamed.sentBytes).toBeLessThan(30 * 1024 * 1024);
  });

  it("refuses an upload above 5 MB while it streams, with 413", async () => {
    const boundary = "----tidewell-limit-test";
    const answer = await streamChunked(baseURL, "/api/uploads", {
      cookie: grower.cookieHeader(),
      contentType: `multipart/form-data; boundary=${boundary}`,
      head: `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="scan.pdf"\r\nContent-Type: application/pdf\r\n\r\n%PDF-1.7\n`,
      filler: 0x20,
      totalBytes: 40 * 1024 * 1024,
    });
    expect(answer.status).toBe(413);
    expect(answer.body.error?.message).toMatch(/larger than 5 MB/);
    expect(answer.sentBytes).toBeLessThan(30 * 1024 * 1024);
  });
});
