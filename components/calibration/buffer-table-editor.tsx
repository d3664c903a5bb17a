"use client";
// A buffer's certificate table typed row by row (temperature °C, pH), with the error of each
// field under it. Checking is lib/calibration's readBufferTableRows; the parent runs it on submit.
import { Plus, X } from "lucide-react";
import { Button } from "@/components/ui/button";
import { BUFFER_TABLE_LIMITS, type BufferTableRow } from "@/lib/calibration";
import { FIELD_CLASS } from "./probe-select";

/** The value a buffer picker uses for "a buffer with its own certificate table". */
export const CERTIFICATE_TABLE = "certificate-table";

/** Rows a new table starts with: the certificate's usual temperatures, pH left to type. */
export function newBufferTableRows(): BufferTableRow[] {
  return ["15", "20", "25", "30"].map((tempC) => ({ tempC, ph: "" }));
}

export function BufferTableEditor({
  name,
  rows,
  onChange,
  errors = {},
}: {
  /** Labels the table for screen readers and tests ("First buffer"). */
  name: string;
  rows: BufferTableRow[];
  onChange: (rows: BufferTableRow[]) => void;
  /** Field errors keyed "<row>.tempC", "<row>.ph", or "_" for the whole table. */
  errors?: Record<string, string>;
}) {
  const set = (i: number, key: keyof BufferTableRow, value: string) => onChange(rows.map((r, j) => (j === i ? { ...r, [key]: value } : r)));
  const tableError = errors._;
  return (
    <fieldset className="mt-2 rounded-md border border-paper-line bg-paper-sunk/40 p-3" data-buffer-table={name} aria-label={`${name}: certificate table`}>
      <legend className="px-1 text-sm font-semibold">Certificate table</legend>
      <p className="mb-2 text-xs text-ink-soft">
        Copy the pH at each temperature from this lot&apos;s certificate, coldest first. Readings between rows are interpolated linearly.
      </p>
      <div className="grid grid-cols-[1fr_1fr_2.5rem] gap-x-2 gap-y-1 text-xs font-medium text-ink-soft" aria-hidden>
        <span>Temperature (°C)</span>
        <span>pH</span>
      </div>
      <ol className="space-y-1">
        {rows.map((r, i) => {
          const tErr = errors[`${i}.tempC`];
          const pErr = errors[`${i}.ph`];
          return (
            <li key={i} className="grid grid-cols-[1fr_1fr_2.5rem] items-start gap-x-2">
              <span>
                <input
                  aria-label={`Row ${i + 1} temperature °C`}
                  aria-invalid={tErr ? true : undefined}
                  inputMode="decimal"
                  className={`${FIELD_CLASS} ${tErr ? "border-bad ring-1 ring-bad" : ""}`}
                  value={r.tempC}
                  onChange={(e) => set(i, "tempC", e.target.value)}
                />
                {tErr ? <span className="block text-xs font-medium text-bad">{tErr}</span> : null}
              </span>
              <span>
                <input
                  aria-label={`Row ${i + 1} pH`}
                  aria-invalid={pErr ? true : undefined}
                  inputMode="decimal"
                  className={`${FIELD_CLASS} ${pErr ? "border-bad ring-1 ring-bad" : ""}`}
                  value={r.ph}
                  onChange={(e) => set(i, "ph", e.target.value)}
                />
                {pErr ? <span className="block text-xs font-medium text-bad">{pErr}</span> : null}
              </span>
              <Button type="button" variant="ghost" size="sm" className="mt-2" aria-label={`Remove row ${i + 1}`} disabled={rows.length <= 1} onClick={() => onChange(rows.filter((_, j) => j !== i))}>
                <X className="size-4" aria-hidden />
              </Button>
            </li>
          );
        })}
      </ol>
      {tableError ? <p className="mt-1 text-xs font-medium text-bad">{tableError}</p> : null}
      {rows.length < BUFFER_TABLE_LIMITS.maxRows ? (
        <Button type="button" variant="secondary" size="sm" className="mt-2" onClick={() => onChange([...rows, { tempC: "", ph: "" }])}>
          <Plus className="mr-1 size-4" aria-hidden /> Add a row
        </Button>
      ) : null}
    </fieldset>
  );
}
