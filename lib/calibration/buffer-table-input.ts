// A buffer's certificate table as a grower types it (rows of temperature and pH) and as it is
// stored ({ points: [tempC, pH][] }, the form bufferPh reads). The same checks serve the forms
// (field errors under each input) and the API (a 422 naming the row).
import { z } from "zod";
import type { BufferTable } from "./buffers";

/** Certificates list a buffer's pH over the range it is used in; ours: 0–60 °C, pH 0–14. */
export const BUFFER_TABLE_LIMITS = { minRows: 2, maxRows: 20, tempC: [0, 60], ph: [0, 14] } as const;

const [T_MIN, T_MAX] = BUFFER_TABLE_LIMITS.tempC;
const [PH_MIN, PH_MAX] = BUFFER_TABLE_LIMITS.ph;

const temperature = z
  .number({ error: "Enter the temperature in °C" })
  .min(T_MIN, `Between ${T_MIN} and ${T_MAX} °C`)
  .max(T_MAX, `Between ${T_MIN} and ${T_MAX} °C`);
const ph = z
  .number({ error: "Enter the pH" })
  .min(PH_MIN, `Between pH ${PH_MIN} and ${PH_MAX}; check the certificate`)
  .max(PH_MAX, `Between pH ${PH_MIN} and ${PH_MAX}; check the certificate`);

const rowCount = `Enter at least ${BUFFER_TABLE_LIMITS.minRows} rows from the certificate`;
const tooMany = `At most ${BUFFER_TABLE_LIMITS.maxRows} rows`;

/** Temperatures strictly increasing, each row after the one before: the order certificates print. */
function increasing<T>(temps: (row: T) => number, path: (i: number) => (string | number)[]) {
  return (rows: T[], ctx: z.RefinementCtx) => {
    for (let i = 1; i < rows.length; i++) {
      const [before, here] = [temps(rows[i - 1]), temps(rows[i])];
      if (!(here > before)) {
        ctx.addIssue({
          code: "custom",
          path: path(i),
          message: here === before ? `${here} °C is listed twice; keep one row per temperature` : `Temperatures must go up row by row: ${here} °C comes after ${before} °C`,
        });
      }
    }
  };
}

/** The stored and API form: `{ points: [[tempC, pH], …] }`. Errors name `points.<row>.<0|1>`. */
export const bufferTableSchema = z.object({
  points: z
    .array(z.tuple([temperature, ph]))
    .min(BUFFER_TABLE_LIMITS.minRows, rowCount)
    .max(BUFFER_TABLE_LIMITS.maxRows, tooMany)
    .superRefine(increasing((r) => r[0], (i) => [i, 0])),
});

/** Reads a typed number; a comma decimal separator is accepted. Empty or junk is NaN. */
function typedNumber(text: string): number {
  const t = text.trim().replace(",", ".");
  return t === "" || !/^[-+]?\d*\.?\d+$/.test(t) ? Number.NaN : Number(t);
}

const typedTemperature = z.string().transform(typedNumber).pipe(temperature);
const typedPh = z.string().transform(typedNumber).pipe(ph);

/** The form: rows of typed text. Errors name `<row>.tempC` and `<row>.ph`. */
export const bufferTableRowsSchema = z
  .array(z.object({ tempC: typedTemperature, ph: typedPh }))
  .min(BUFFER_TABLE_LIMITS.minRows, rowCount)
  .max(BUFFER_TABLE_LIMITS.maxRows, tooMany)
  .superRefine(increasing((r) => r.tempC, (i) => [i, "tempC"]));

export interface BufferTableRow {
  tempC: string;
  ph: string;
}

export type BufferTableCheck =
  | { ok: true; table: BufferTable; text: string }
  | { ok: false; message: string; fields: Record<string, string> };

function fieldsOf(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) fields[issue.path.join(".") || "_"] ??= issue.message;
  return fields;
}

/**
 * Checks typed rows; on success returns the table and its stored text. Field errors are keyed
 * `<row>.tempC`, `<row>.ph` (row from 0), or `_` for the table as a whole.
 */
export function readBufferTableRows(rows: readonly BufferTableRow[]): BufferTableCheck {
  const parsed = bufferTableRowsSchema.safeParse(rows);
  if (!parsed.success) {
    const fields = fieldsOf(parsed.error);
    // The message names the first problem in reading order (row by row), and how many more there are.
    const rowOf = (key: string) => Number(/^(\d+)\./.exec(key)?.[1] ?? -1);
    const keys = Object.keys(fields).sort((a, b) => rowOf(a) - rowOf(b) || (a.endsWith("tempC") ? -1 : 1));
    const first = keys[0];
    const more = keys.length > 1 ? ` (and ${keys.length - 1} more to fix)` : "";
    const where = rowOf(first) >= 0 ? `Row ${rowOf(first) + 1} of the buffer table: ` : "";
    return { ok: false, fields, message: `${where}${fields[first]}${more}` };
  }
  const table: BufferTable = { points: parsed.data.map((r) => [r.tempC, r.ph] as const) };
  return { ok: true, table, text: JSON.stringify(table) };
}

/**
 * Why a stored buffer text that is a table cannot be used, in words naming the row; null when it
 * is fine or is not a table (a buffer id).
 */
export function bufferTableProblem(spec: unknown): string | null {
  if (typeof spec !== "object" || spec === null) return null;
  const parsed = bufferTableSchema.safeParse(spec);
  if (parsed.success) return null;
  const issue = parsed.error.issues[0];
  const [, row] = issue.path;
  return typeof row === "number" ? `Row ${row + 1} of the buffer table: ${issue.message}` : `The buffer table: ${issue.message}`;
}

/** Rows to show for a stored table (for editing it again). */
export function bufferTableToRows(table: BufferTable): BufferTableRow[] {
  return table.points.map(([t, p]) => ({ tempC: String(t), ph: String(p) }));
}
