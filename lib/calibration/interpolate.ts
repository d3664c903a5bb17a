import { CalibrationInputError } from "./errors";
import { fmtTemp } from "./format";

/** A table of [temperature °C, value] rows, sorted by temperature, no duplicates. */
export type TemperatureTable = readonly (readonly [number, number])[];

/**
 * Linear interpolation in a temperature table. A temperature outside the
 * table throws (no extrapolation); `what` names the table in the message.
 */
export function interpolateTable(
  table: TemperatureTable,
  tempC: number,
  what: string,
): number {
  const first = table[0];
  const last = table[table.length - 1];
  if (first === undefined || last === undefined) {
    throw new CalibrationInputError("invalid-table", `${what} has no rows`);
  }
  if (tempC < first[0] || tempC > last[0]) {
    const range =
      first[0] === last[0]
        ? `only at ${fmtTemp(first[0])}`
        : `only from ${fmtTemp(first[0])} to ${fmtTemp(last[0])}`;
    throw new CalibrationInputError(
      "temperature-out-of-range",
      `${what} is known ${range}; ${fmtTemp(tempC)} is outside that range`,
    );
  }
  for (let i = 0; i < table.length; i++) {
    const [t1, v1] = table[i];
    if (tempC === t1) return v1;
    const next = table[i + 1];
    if (next !== undefined && tempC < next[0]) {
      const [t2, v2] = next;
      return v1 + ((v2 - v1) * (tempC - t1)) / (t2 - t1);
    }
  }
  return last[1];
}
