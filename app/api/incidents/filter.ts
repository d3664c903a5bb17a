// The incident history's filters, from a query string (the page and the CSV export share them).
import { z } from "zod";
import { CAUSES } from "@/lib/alerts";
import { INCIDENT_STATES } from "@/db/schema";
import type { IncidentFilter } from "@/db/queries/incidents";

const DAY_MS = 86_400_000;
const day = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/)
  .refine((s) => Number.isFinite(Date.parse(`${s}T00:00:00Z`)), "Not a date");
const id = z.coerce.number().int().positive();

export const incidentQuery = z.object({
  site: id.optional().catch(undefined),
  tank: id.optional().catch(undefined),
  cause: z.enum(CAUSES as [string, ...string[]]).optional().catch(undefined),
  state: z.enum(INCIDENT_STATES).optional().catch(undefined),
  from: day.optional().catch(undefined),
  to: day.optional().catch(undefined),
});
export type IncidentQuery = z.infer<typeof incidentQuery>;

/** Dates are whole UTC days: `to` includes its day. */
export function toFilter(q: IncidentQuery): IncidentFilter {
  return {
    siteId: q.site,
    tankId: q.tank,
    cause: q.cause,
    state: q.state,
    from: q.from ? Date.parse(`${q.from}T00:00:00Z`) : undefined,
    to: q.to ? Date.parse(`${q.to}T00:00:00Z`) + DAY_MS - 1 : undefined,
  };
}

/** The same filters as a query string, for links (export, chart drill-down). */
export function toSearch(q: IncidentQuery): string {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined && v !== "") p.set(k, String(v));
  const s = p.toString();
  return s ? `?${s}` : "";
}
