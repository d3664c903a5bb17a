// Text of the calibration reports (PDF), shared by the renderer and the tests that read it back.
import { z } from "zod";
import { fmt } from "../calibration/format";

export const DAY_MS = 86_400_000;

/** A report's period: whole UTC days from `from` to `to`, both included. */
export interface ReportPeriod {
  from: string; // YYYY-MM-DD
  to: string; // YYYY-MM-DD
  startMs: number;
  endMs: number; // exclusive: the start of the day after `to`
}

const MAX_PERIOD_DAYS = 5 * 366;

export const periodQuery = z
  .object({
    from: z.iso.date("Enter the start of the period as YYYY-MM-DD").optional(),
    to: z.iso.date("Enter the end of the period as YYYY-MM-DD").optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: "The period must start on or before its end", path: ["from"] });

/** The period asked for; by default the twelve months up to today (UTC). */
export function reportPeriod(q: { from?: string; to?: string }, now: number): ReportPeriod {
  const to = q.to ?? new Date(now).toISOString().slice(0, 10);
  const endMs = Date.parse(`${to}T00:00:00Z`) + DAY_MS;
  const from = q.from ?? new Date(endMs - 365 * DAY_MS).toISOString().slice(0, 10);
  const startMs = Date.parse(`${from}T00:00:00Z`);
  if (endMs - startMs > MAX_PERIOD_DAYS * DAY_MS) return reportPeriod({ from: new Date(endMs - MAX_PERIOD_DAYS * DAY_MS).toISOString().slice(0, 10), to }, now);
  return { from, to, startMs, endMs };
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** "12 Nov 2026 14:03" in the site's time zone (the zone is named once in each report's header). */
export function reportDateTime(ms: number | null | undefined, timeZone: string): string {
  if (ms === null || ms === undefined) return "—";
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat("en-GB", { timeZone, day: "numeric", month: "numeric", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" })
      .formatToParts(new Date(ms))
      .map((p) => [p.type, p.value]),
  );
  return `${Number(parts.day)} ${MONTHS[Number(parts.month) - 1]} ${parts.year} ${parts.hour}:${parts.minute}`;
}

export function reportDate(isoDay: string): string {
  return reportDateTime(Date.parse(`${isoDay}T12:00:00Z`), "UTC").slice(0, -6);
}

export const RUN_STATUS_WORD = { accepted: "Accepted", rejected: "Rejected", abandoned: "Abandoned", in_progress: "In progress" } as const;

/** The fitted values of a finished run, as one line. */
export function runResultText(run: { status: string; slopePct: number | null; offsetMv: number | null; cellConstant: number | null; deviationPct: number | null }): string {
  if (run.slopePct !== null) return `Slope ${fmt(run.slopePct, 1)} % · offset ${fmt(run.offsetMv ?? 0, 1)} mV`;
  if (run.cellConstant !== null) return `Cell constant ${fmt(run.cellConstant, 3)} /cm${run.deviationPct !== null ? ` · ${fmt(run.deviationPct, 1)} % from nominal` : ""}`;
  return "No fit recorded";
}

export function asFoundText(run: { asFoundErrorPh: number | null; asFoundErrorPct: number | null }): string | null {
  if (run.asFoundErrorPh !== null) return `As-found error ${signed(run.asFoundErrorPh, 2)} pH`;
  if (run.asFoundErrorPct !== null) return `As-found error ${signed(run.asFoundErrorPct, 1)} %`;
  return null;
}

export function signed(n: number, digits: number): string {
  const s = fmt(n, digits);
  return Number(s) > 0 ? `+${s}` : s;
}

/** The file name a report is downloaded as, e.g. tidewell-calibration-PH-24-0101-2026-01-01-to-2026-12-31.pdf. */
export function reportFilename(subject: string, period: ReportPeriod): string {
  const safe = subject.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "");
  return `tidewell-calibration-${safe}-${period.from}-to-${period.to}.pdf`;
}
