/** A pH or EC probe as the entry forms list it. */
export interface ProbeOption {
  id: number;
  kind: "ph" | "ec";
  serial: string;
  tankName: string;
}

/** A local date-time input's value for a time (the browser's zone). */
export function toLocalInput(ms: number): string {
  const d = new Date(ms - new Date(ms).getTimezoneOffset() * 60_000);
  return d.toISOString().slice(0, 16);
}

/** How a probe's measure is written: pH, EC, Temp. */
export const KIND_LABEL = { ph: "pH", ec: "EC", temp: "Temp" } as const;
