import { requestNow } from "@/app/_server/clock";
import { MEASURE_SHORT } from "@/lib/display/labels";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { calibrationRuns, holds, incidents } from "@/db/schema";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { TankLiveView } from "@/components/tanks/tank-live-view";
import { CalibrationBadge } from "@/components/tanks/state-badge";
import { formatDateTime } from "@/lib/display/time";

export const metadata: Metadata = { title: "Tank" };
export const dynamic = "force-dynamic";

export default async function TankPage({ params }: { params: Promise<{ id: string }> }) {
  const user = (await currentUser())!;
  const id = Number((await params).id);
  if (!Number.isInteger(id)) notFound();
  const now = requestNow();
  const [tank] = await tankOverview(getDb(), user.orgId, { tankId: id, now });
  if (!tank) notFound();
  const db = getDb();
  const [runs, recentHolds, recentIncidents] = await Promise.all([
    db.select().from(calibrationRuns).where(eq(calibrationRuns.tankId, id)).orderBy(desc(calibrationRuns.startedAt)).limit(12),
    db.select().from(holds).where(eq(holds.tankId, id)).orderBy(desc(holds.placedAt)).limit(6),
    db.select().from(incidents).where(and(eq(incidents.tankId, id), eq(incidents.orgId, user.orgId))).orderBy(desc(incidents.openedAt)).limit(6),
  ]);
  const serial = new Map(tank.probes.map((p) => [p.id, `${MEASURE_SHORT[p.kind]} ${p.serial}`]));
  return (
    <>
      <PageHeader title={tank.name} subtitle={`${tank.siteName}${tank.zoneName ? ` · ${tank.zoneName}` : ""} · ${tank.crop}`} actions={user.role !== "night_manager" ? <Link href={`/calibrations/new?tank=${tank.id}`} className="inline-flex h-11 items-center rounded-md bg-accent-700 px-4 text-sm font-medium text-white hover:bg-accent-800">Calibrate</Link> : null} />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="min-w-0">
          <TankLiveView initialTank={tank} ecUnit={user.ecUnit} renderedAt={now} />
        </div>
        <div className="space-y-6">
          <Card className="p-4">
            <h2 className="mb-3 font-semibold">Probes</h2>
            <ul className="space-y-2 text-sm">
              {tank.probes.map((p) => (
                <li key={p.id} className="flex items-center justify-between gap-2">
                  <span>
                    <span className="font-medium">{MEASURE_SHORT[p.kind]}</span> <code className="font-mono text-xs text-ink-soft">{p.serial}</code>
                  </span>
                  <CalibrationBadge status={p.calibration.status} />
                </li>
              ))}
            </ul>
          </Card>
          <Card className="p-4">
            <h2 className="mb-3 font-semibold">Recent calibration runs</h2>
            <ul className="space-y-2 text-sm">
              {runs.map((r) => (
                <li key={r.id} className="border-b border-paper-line pb-2 last:border-0">
                  <div className="flex justify-between gap-2">
                    <span className="font-medium">{serial.get(r.probeId) ?? `Probe ${r.probeId}`}</span>
                    <span className={r.status === "accepted" ? "text-ok" : r.status === "rejected" ? "text-bad" : "text-ink-soft"}>{r.status}</span>
                  </div>
                  <div className="num text-xs text-ink-soft">
                    {formatDateTime(r.completedAt ?? r.startedAt)} ·{" "}
                    {r.slopePct !== null ? `slope ${r.slopePct.toFixed(1)} %, offset ${r.offsetMv?.toFixed(1)} mV` : r.cellConstant !== null ? `cell constant ${r.cellConstant.toFixed(3)} /cm` : ""}
                  </div>
                  {r.reasons.length ? <div className="text-xs text-bad">{r.reasons.join(" ")}</div> : null}
                </li>
              ))}
              {runs.length === 0 ? <li className="text-ink-soft">No calibrations recorded.</li> : null}
            </ul>
          </Card>
          <Card className="p-4">
            <h2 className="mb-3 font-semibold">Holds</h2>
            <ul className="space-y-1 text-sm">
              {recentHolds.map((h) => (
                <li key={h.id} className="num text-ink-soft">
                  {formatDateTime(h.placedAt)} — {h.reason} ({h.releasedAt ? `released ${h.releaseKind === "expired" ? "on expiry" : "by hand"}` : "active"})
                </li>
              ))}
              {recentHolds.length === 0 ? <li className="text-ink-soft">No holds.</li> : null}
            </ul>
          </Card>
          <Card className="p-4">
            <h2 className="mb-3 font-semibold">Incidents</h2>
            <ul className="space-y-1 text-sm">
              {recentIncidents.map((i) => (
                <li key={i.id}>
                  <Link className="hover:underline" href={`/incidents/${i.id}`}>
                    {formatDateTime(i.openedAt)} — {i.message}
                  </Link>{" "}
                  <span className="text-xs text-ink-soft">({i.state})</span>
                </li>
              ))}
              {recentIncidents.length === 0 ? <li className="text-ink-soft">No incidents.</li> : null}
            </ul>
          </Card>
        </div>
      </div>
    </>
  );
}
