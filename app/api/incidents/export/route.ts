import { csvTable } from "@/lib/settings/csv";
import { getDb } from "@/db/client";
import { listIncidents } from "@/db/queries/incidents";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { describeCause, type Cause } from "@/lib/alerts";
import { incidentQuery, toFilter } from "../filter";

const COLUMNS = ["id", "opened_at", "site", "tank", "cause", "measure", "severity", "state", "message", "calibration_lapsed", "acknowledged_at", "acknowledged_by", "minutes_to_acknowledge", "cleared_at", "resolved_at", "resolved_by", "minutes_to_resolve", "escalated_at"] as const;
const iso = (ms: number | null) => (ms === null ? "" : new Date(ms).toISOString());
const minutes = (from: number, to: number | null) => (to === null ? "" : ((to - from) / 60_000).toFixed(1));

/** The filtered incident history as CSV (UTC times, durations in minutes). */
export const GET = guarded({ roles: OWNER_ONLY, action: "export incidents", query: incidentQuery }, async ({ user, query }) => {
  const rows = await listIncidents(getDb(), user.orgId, { ...toFilter(query), limit: 100_000 });
  const records = rows.map(({ incident: i, tankName, siteName, acknowledgedByName, resolvedByName }) => ({
      id: i.id,
      opened_at: iso(i.openedAt),
      site: siteName,
      tank: tankName,
      cause: describeCause(i.cause as Cause),
      measure: i.measure ?? "",
      severity: i.severity,
      state: i.state,
      message: i.message,
      calibration_lapsed: i.calibrationLapsed ? "yes" : "no",
      acknowledged_at: iso(i.acknowledgedAt),
      acknowledged_by: acknowledgedByName ?? "",
      minutes_to_acknowledge: minutes(i.openedAt, i.acknowledgedAt),
      cleared_at: iso(i.clearedAt),
      resolved_at: iso(i.resolvedAt),
      resolved_by: i.resolvedAt && !resolvedByName ? "automatically" : (resolvedByName ?? ""),
      minutes_to_resolve: minutes(i.openedAt, i.resolvedAt),
      escalated_at: iso(i.escalatedAt),
    }));
  // Fields and data given separately, so an empty export still has its header row.
  const csv = csvTable(COLUMNS, records.map((r) => COLUMNS.map((c) => r[c])));
  const stamp = new Date().toISOString().slice(0, 10);
  return new Response(csv, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="tidewell-incidents-${stamp}.csv"` },
  });
});
