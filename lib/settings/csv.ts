// The one CSV writer of every export. Text cells that a spreadsheet would run as a formula (they
// begin with =, +, -, @, a tab or a carriage return) get a leading single quote, as OWASP's
// CSV-injection guidance says, so a tank name or note like `=HYPERLINK(…)` opens as text.
// Numbers are written as numbers and never prefixed: they come from our own code (a negative
// offset such as -0.5 is a value, not a formula), and a quote would turn them into text.
import Papa from "papaparse";

export type CsvCell = string | number | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;
const options = { escapeFormulae: FORMULA_START, newline: "\r\n" } as const;

/** A header row and the rows, CRLF-terminated. */
export function csvTable(fields: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return terminated(Papa.unparse({ fields: [...fields], data: rows.map((r) => r.map(cell)) }, options));
}

/** Rows without a header (for a streamed export's later pages), CRLF-terminated; "" for none. */
export function csvRows(rows: readonly (readonly CsvCell[])[]): string {
  if (rows.length === 0) return "";
  return terminated(Papa.unparse(rows.map((r) => r.map(cell)), { ...options, header: false }));
}

// Papaparse ends a header-only table with a newline and a table with rows without one.
const terminated = (csv: string) => (csv.endsWith("\r\n") ? csv : `${csv}\r\n`);

function cell(v: CsvCell): string | number {
  return v === null || v === undefined ? "" : v;
}
