import { FileDown } from "lucide-react";

const input = "mt-1 block h-12 rounded-md border border-paper-line bg-paper-raised px-3 text-sm";

/** A plain GET form to a report route: the PDF downloads without any script; the period travels as ?from=&to=. */
export function ReportDownload({ action, label, defaultFrom, defaultTo, testId }: { action: string; label: string; defaultFrom: string; defaultTo: string; testId: string }) {
  return (
    <form method="get" action={action} data-testid={testId} className="flex flex-wrap items-end gap-3">
      <label className="block text-sm font-medium">
        From
        <input type="date" name="from" defaultValue={defaultFrom} className={input} required />
      </label>
      <label className="block text-sm font-medium">
        To
        <input type="date" name="to" defaultValue={defaultTo} className={input} required />
      </label>
      <button className="inline-flex h-12 items-center gap-2 rounded-md border border-paper-line bg-paper-raised px-4 text-sm font-medium hover:bg-paper-sunk">
        <FileDown className="size-4" aria-hidden /> {label}
      </button>
    </form>
  );
}

/** The default period of a report form: the twelve months up to today (UTC). */
export function defaultReportPeriod(now: number): { from: string; to: string } {
  const to = new Date(now).toISOString().slice(0, 10);
  const from = new Date(now - 365 * 86_400_000 + 86_400_000).toISOString().slice(0, 10);
  return { from, to };
}
