import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getDb } from "@/db/client";
import { incidentWithTimeline } from "@/db/queries/incidents";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { IncidentStateBadge } from "@/components/incidents/state";
import { describeCause, type Cause } from "@/lib/alerts";
import { formatDateTime } from "@/lib/display/time";

export const metadata: Metadata = { title: "Incident" };
export const dynamic = "force-dynamic";

const KIND_LABEL: Record<string, string> = {
  opened: "Opened",
  notified: "Notified",
  acknowledged: "Acknowledged",
  note: "Note",
  held: "Tank held",
  cleared: "Condition cleared",
  escalated: "Escalated",
  resolved: "Resolved",
  reopened: "Reopened",
};

export default async function IncidentPage({ params }: { params: Promise<{ id: string }> }) {
  const user = (await currentUser())!;
  const id = Number((await params).id);
  if (!Number.isInteger(id)) notFound();
  const data = await incidentWithTimeline(getDb(), user.orgId, id);
  if (!data) notFound();
  const { incident: i } = data;
  return (
    <>
      <PageHeader title={`${data.tankName}: ${describeCause(i.cause as Cause)}`} subtitle={`${data.siteName} · opened ${formatDateTime(i.openedAt)}`} actions={<IncidentStateBadge state={i.state} />} />
      <Card className="max-w-3xl p-5">
        <p className="mb-4 font-medium">{i.message}</p>
        <ol className="relative space-y-4 border-l-2 border-paper-line pl-5">
          {data.events.map(({ event: e, userName }) => (
            <li key={e.id} className="relative">
              <span className="absolute -left-[27px] top-1 size-3 rounded-full border-2 border-paper-raised bg-accent-600" aria-hidden />
              <p className="text-sm font-semibold">
                {KIND_LABEL[e.kind] ?? e.kind}
                {userName ? <span className="font-normal text-ink-soft"> · {userName}</span> : null}
              </p>
              <p className="num text-xs text-ink-faint">{formatDateTime(e.at)}</p>
              {e.detail ? <p className="mt-1 text-sm text-ink-soft">{e.detail}</p> : null}
            </li>
          ))}
        </ol>
      </Card>
    </>
  );
}
