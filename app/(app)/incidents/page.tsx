import type { Metadata } from "next";
import Link from "next/link";
import { getDb } from "@/db/client";
import { listIncidents } from "@/db/queries/incidents";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { IncidentStateBadge } from "@/components/incidents/state";
import { describeCause, type Cause } from "@/lib/alerts";
import { formatDateTime, formatDuration } from "@/lib/display/time";

export const metadata: Metadata = { title: "Incidents" };
export const dynamic = "force-dynamic";

export default async function IncidentsPage({ searchParams }: { searchParams: Promise<{ tank?: string }> }) {
  const user = (await currentUser())!;
  const tank = Number((await searchParams).tank) || undefined;
  const rows = await listIncidents(getDb(), user.orgId, { tankId: tank });
  return (
    <>
      <PageHeader title="Incidents" subtitle="Alerts grouped per tank and cause: open → acknowledged → resolved" />
      <Card className="overflow-x-auto">
        <table className="w-full min-w-[820px] text-sm">
          <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-4 py-3">State</th>
              <th className="px-4 py-3">Opened</th>
              <th className="px-4 py-3">Tank</th>
              <th className="px-4 py-3">Cause</th>
              <th className="px-4 py-3">What happened</th>
              <th className="px-4 py-3">To acknowledge</th>
              <th className="px-4 py-3">To resolve</th>
            </tr>
          </thead>
          <tbody>
            {rows.map(({ incident: i, tankName, siteName }) => (
              <tr key={i.id} className="border-b border-paper-line last:border-0 hover:bg-paper">
                <td className="px-4 py-3">
                  <IncidentStateBadge state={i.state} />
                </td>
                <td className="num px-4 py-3">
                  <Link className="hover:underline" href={`/incidents/${i.id}`}>
                    {formatDateTime(i.openedAt)}
                  </Link>
                </td>
                <td className="px-4 py-3">
                  {tankName}
                  <div className="text-xs text-ink-soft">{siteName}</div>
                </td>
                <td className="px-4 py-3">{describeCause(i.cause as Cause)}</td>
                <td className="px-4 py-3">{i.message}</td>
                <td className="num px-4 py-3">{i.acknowledgedAt ? formatDuration(i.acknowledgedAt - i.openedAt) : "—"}</td>
                <td className="num px-4 py-3">{i.resolvedAt ? formatDuration(i.resolvedAt - i.openedAt) : "—"}</td>
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={7} className="px-4 py-8 text-center text-ink-soft">
                  No incidents.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </Card>
    </>
  );
}
