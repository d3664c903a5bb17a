import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getDb } from "@/db/client";
import { incidentWithTimeline } from "@/db/queries/incidents";
import { currentUser } from "@/app/_server/session";
import { requestNow } from "@/app/_server/clock";
import { loadTankSeries } from "@/app/api/tanks/[id]/series/load-series";
import { Card, PageHeader } from "@/components/ui/card";
import { IncidentStateBadge } from "@/components/incidents/state";
import { IncidentTimeline } from "@/components/incidents/timeline";
import { IncidentChart } from "@/components/incidents/incident-chart";
import { NoteForm, ResolveForm } from "@/components/incidents/incident-actions";
import { AcknowledgeButton } from "@/components/incidents/acknowledge-button";
import { describeCause, formatDuration, type Cause } from "@/lib/alerts";
import { formatDateTime } from "@/lib/display/time";

export const metadata: Metadata = { title: "Incident" };
export const dynamic = "force-dynamic";

const AROUND_MS = 2 * 60 * 60_000;
/** 30-second buckets over the four hours around a short incident: read from raw readings. */
const CHART_POINTS = 480;

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{label}</dt>
      <dd className="num mt-0.5 text-sm">{children}</dd>
    </div>
  );
}

export default async function IncidentPage({ params }: { params: Promise<{ id: string }> }) {
  const user = (await currentUser())!;
  const id = Number((await params).id);
  if (!Number.isInteger(id)) notFound();
  const db = getDb();
  const data = await incidentWithTimeline(db, user.orgId, id);
  if (!data) notFound();
  const { incident: i } = data;
  const now = requestNow();
  // Two hours either side; a long incident shows its first day.
  const to = Math.min(now, (i.resolvedAt ?? now) + AROUND_MS, i.openedAt + 24 * 60 * 60_000);
  const series = await loadTankSeries(db, user.orgId, i.tankId, i.openedAt - AROUND_MS, Math.max(to, i.openedAt + 60_000), CHART_POINTS);
  const kinds: ("ph" | "ec" | "temp")[] = i.measure === "ph" || i.measure === "ec" || i.measure === "temp" ? [i.measure] : ["ph", "ec", "temp"];
  const canResolve = user.role !== "night_manager" && i.state !== "resolved";
  const by = (uid: number | null) => data.events.find((e) => e.event.userId === uid)?.userName ?? null;

  return (
    <>
      <PageHeader
        title={`${data.tankName}: ${describeCause(i.cause as Cause)}`}
        subtitle={
          <>
            <Link className="hover:underline" href={`/tanks/${i.tankId}`}>
              {data.siteName} · {data.tankName}
            </Link>{" "}
            · opened {formatDateTime(i.openedAt)}
          </>
        }
        actions={<IncidentStateBadge state={i.state} />}
      />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_26rem]">
        <div className="min-w-0 space-y-6">
          <Card className="space-y-4 p-5">
            <p className="text-lg font-medium" data-incident-message>
              {i.message}
            </p>
            {i.calibrationLapsed ? (
              <p className="text-sm text-warn">The probe&apos;s calibration had lapsed when this opened: the reading may be off. Calibrate before trusting it.</p>
            ) : null}
            <dl className="grid grid-cols-2 gap-4 sm:grid-cols-4">
              <Fact label="Severity">{i.severity}</Fact>
              <Fact label="Acknowledged">
                {i.acknowledgedAt ? `${formatDuration(i.acknowledgedAt - i.openedAt)} after opening${by(i.acknowledgedBy) ? ` · ${by(i.acknowledgedBy)}` : ""}` : "not yet"}
              </Fact>
              <Fact label="Condition">{i.clearedAt ? `cleared ${formatDateTime(i.clearedAt)}` : i.state === "resolved" ? "—" : "still present"}</Fact>
              <Fact label="Resolved">{i.resolvedAt ? `${formatDuration(i.resolvedAt - i.openedAt)} after opening` : "not yet"}</Fact>
            </dl>
            {i.state === "open" || canResolve ? (
              <div className="flex flex-wrap items-center gap-3 border-t border-paper-line pt-4">
                {i.state === "open" ? <AcknowledgeButton incidentIds={[i.id]} size="md" /> : null}
                {canResolve ? <ResolveForm incidentId={i.id} /> : null}
              </div>
            ) : null}
          </Card>
          <Card className="p-5">
            <h2 className="mb-3 font-semibold">Readings around it</h2>
            {series ? <IncidentChart data={series} kinds={kinds} ecUnit={user.ecUnit} /> : <p className="text-sm text-ink-soft">No readings.</p>}
          </Card>
        </div>
        <div className="space-y-6">
          <Card className="p-5">
            <h2 className="mb-4 font-semibold">Timeline</h2>
            <IncidentTimeline events={data.events} />
          </Card>
          <Card className="p-5">
            <NoteForm incidentId={i.id} />
          </Card>
        </div>
      </div>
    </>
  );
}
