// Request bodies are read against a cap while they stream in: a declared Content-Length above the
// cap is refused unread, and an undeclared (chunked) body is cut off the moment it passes the cap,
// so nobody can make the server buffer an unbounded body.
import { ApiError } from "./errors";

/** JSON bodies of the API; routes that take more say so (RouteSpec.maxBodyBytes). */
export const MAX_JSON_BODY_BYTES = 64 * 1024;

export function formatBytes(n: number): string {
  return n >= 1024 * 1024 ? `${+(n / (1024 * 1024)).toFixed(1)} MB` : `${Math.round(n / 1024)} KiB`;
}

export function bodyTooLarge(maxBytes: number, what = "The request body"): ApiError {
  return new ApiError(413, "too_large", `${what} is larger than ${formatBytes(maxBytes)}; send less at once.`);
}

/** The body's bytes, at most `maxBytes` of them; 413 (`tooLarge`) as soon as there are more. */
export async function readBodyCapped(req: Request, maxBytes: number, tooLarge: () => ApiError = () => bodyTooLarge(maxBytes)): Promise<Uint8Array<ArrayBuffer>> {
  const declared = req.headers.get("content-length");
  if (declared !== null && Number(declared) > maxBytes) throw tooLarge();
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}
