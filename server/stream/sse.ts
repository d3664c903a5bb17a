// Server-sent events wire format (WHATWG HTML, "Server-sent events"): fields, then a blank line.
// Buffers, so one encoding can be written to many sockets as is.

export function sseEvent(event: string, data: unknown, id?: number): Buffer {
  const idLine = id === undefined ? "" : `id: ${id}\n`;
  return Buffer.from(`${idLine}event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
}

/** Tells the browser how long to wait before reconnecting after a drop. */
export function sseRetry(ms: number): Buffer {
  return Buffer.from(`retry: ${ms}\n\n`);
}
