// Server-sent events wire format (WHATWG HTML, "Server-sent events"): fields, then a blank line.
const encoder = new TextEncoder();

export function sseEvent(event: string, data: unknown, id?: number): Uint8Array {
  const idLine = id === undefined ? "" : `id: ${id}\n`;
  return encoder.encode(`${idLine}event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
}

/** Tells the browser how long to wait before reconnecting after a drop. */
export function sseRetry(ms: number): Uint8Array {
  return encoder.encode(`retry: ${ms}\n\n`);
}

export function sseComment(text: string): Uint8Array {
  return encoder.encode(`: ${text}\n\n`);
}
