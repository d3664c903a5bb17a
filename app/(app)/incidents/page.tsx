import type { Metadata } from "next";
import { Download } from "lucide-react";
import { getDb } from "@/db/client";
import { incidentFilterOptions, listIncidents } from "@/db/queries/incidents";
import { currentUser } from "@/app/_server/session";
import { requestNow } from "@/app/_server/clock";
import { incidentQuery, toFilter, toSearch } from "@/app/api/incidents/filter";
import { Card, PageHeader } from "@/components/ui/card";
import { HistoryFilters } from "@/components/incidents/history-filters";
import { HistoryTable, type HistoryRow } from "@/components/incidents/history-table";
import { IncidentTrends } from "@/components/incidents/trend-chart";
import { CAUSES, describeCause, formatDuration, type Cause } from "@/lib/alerts";
import { countsOverTime, responseTimes, type Spread } from "@/lib/alerts/stats";

export const metadata: Metadata = { title: "Incidents" };
export const dynamic = "force-dynamic";

const DAY_MS = 86_400_000;

function Figure({ label, spread }: { label: string; spread: Spread }) {
  return (
    <Card className="p-4" data-figure={label}>
      <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{label}</p>
      <p className="num mt-1 text-2xl font-semibold">{spread.median === null ? "—" : formatDuration(spread.median)}</p>
      <p className="num text-sm text-ink-soft">
        median · 90th percentile {spread.p90 === null ? "—" : formatDuration(spread.p90)} · over {spread.count}
      </p>
    </Card>
  );
}

export default async function IncidentsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = (await currentUser())!;
  const query = incidentQuery.parse(await searchParams);
  const filter = toFilter(query);
  const db = getDb();
  const [rows, options] = await Promise.all([listIncidents(db, user.orgId, filter), incidentFilterOptions(db, user.orgId)]);
  const now = requestNow();

  const table: HistoryRow[] = rows.map(({ incident: i, tankName, siteName, acknowledgedByName }) => ({
    id: i.id,
    state: i.state,
    openedAt: i.openedAt,
    site: siteName,
    tank: tankName,
    cause: describeCause(i.cause as Cause),
    message: i.message,
    calibrationLapsed: i.calibrationLapsed,
    toAcknowledgeMs: i.acknowledgedAt === null ? null : i.acknowledgedAt - i.openedAt,
    toResolveMs: i.resolvedAt === null ? null : i.resolvedAt - i.openedAt,
    acknowledgedBy: acknowledgedByName,
  }));
  const times = responseTimes(rows.map((r) => r.incident));
  const rangeTo = Math.min(now, filter.to ?? now) + 1;
  const rangeFrom = filter.from ?? Math.min(rangeTo - 30 * DAY_MS, ...rows.map((r) => r.incident.openedAt));
  const span = { from: rangeFrom, to: rangeTo, bucketMs: DAY_MS, top: 5 };
  const byCause = countsOverTime(rows.map((r) => ({ openedAt: r.incident.openedAt, key: r.incident.cause })), { ...span, otherKey: "other" });
  const byTank = countsOverTime(rows.map((r) => ({ openedAt: r.incident.openedAt, key: r.tankName })), { ...span, otherKey: "other tanks" });
  const causeNames: Record<string, string> = { other: "Other causes" };
  for (const c of CAUSES) causeNames[c] = describeCause(c);
  const openNow = rows.filter((r) => r.incident.state !== "resolved").length;

  return (
    <>
      <PageHeader
        title="Incidents"
        subtitle="Alerts grouped per tank and cause: open → acknowledged → resolved"
        actions={
          user.role === "owner" ? (
            <a href={`/api/incidents/export${toSearch(query)}`} download className="inline-flex h-10 items-center gap-2 rounded-md border border-paper-line bg-paper-raised px-4 text-sm font-medium hover:bg-paper-sunk">
              <Download className="size-4" aria-hidden /> Export CSV
            </a>
          ) : null
        }
      />
      <Card className="mb-5 p-4">
        <HistoryFilters query={query} sites={options.sites} tanks={options.tanks} causes={CAUSES.map((c) => ({ value: c, label: describeCause(c) }))} />
      </Card>
      <div className="mb-5 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <Card className="p-4" data-figure="count">
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Incidents</p>
          <p className="num mt-1 text-2xl font-semibold">{rows.length}</p>
          <p className="text-sm text-ink-soft">{openNow} not yet resolved</p>
        </Card>
        <Figure label="Time to acknowledge" spread={times.acknowledge} />
        <Figure label="Time to resolve" spread={times.resolve} />
        <Card className="p-4 text-sm text-ink-soft">
          Times count from when an incident opened. Incidents that resolved themselves count towards time to resolve. Alerts are an aid, not a substitute for walking the tanks.
        </Card>
      </div>
      <Card className="mb-5 p-4">
        <IncidentTrends byCause={byCause} byTank={byTank} causeNames={causeNames} />
      </Card>
      <HistoryTable rows={table} />
    </>
  );
}
