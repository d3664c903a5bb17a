// Polling until a condition holds, with a clear failure message.

export const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Calls `probe` every `intervalMs` until `done(value)` is true; resolves with that value, or
 * rejects after `timeoutMs` with `message` and the last value seen.
 */
export async function waitFor<T>(
  probe: () => Promise<T> | T,
  done: (value: T) => boolean,
  { timeoutMs = 30_000, intervalMs = 200, message = "condition" }: { timeoutMs?: number; intervalMs?: number; message?: string } = {},
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let last: T | undefined;
  for (;;) {
    last = await probe();
    if (done(last)) return last;
    if (Date.now() > deadline) throw new Error(`timed out after ${timeoutMs} ms waiting for ${message}; last value: ${JSON.stringify(last)}`);
    await sleep(intervalMs);
  }
}
