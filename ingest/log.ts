// One line per event, prefixed with the process's role, so interleaved logs of the broker,
// the ingest and the simulator stay readable. Never pass secrets to these functions.

export interface Logger {
  info(message: string): void;
  warn(message: string): void;
  error(message: string, err?: unknown): void;
}

export function logger(role: string): Logger {
  const prefix = `[${role}]`;
  return {
    info: (message) => console.log(`${prefix} ${message}`),
    warn: (message) => console.warn(`${prefix} ${message}`),
    error: (message, err) => console.error(`${prefix} ${message}${err === undefined ? "" : `: ${errorText(err)}`}`),
  };
}

export function errorText(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

/** Makes an untrusted string safe for one log line: printable ASCII, bounded length. */
export function printable(value: string, max = 64): string {
  const clean = value.replace(/[^\x20-\x7e]/g, "?");
  return clean.length > max ? `${clean.slice(0, max)}…` : clean;
}
