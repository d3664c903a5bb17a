import type { Metadata } from "next";
import Link from "next/link";
import { ClipboardPen, FlaskConical, Gauge, PlayCircle } from "lucide-react";
import { requestNow } from "@/app/_server/clock";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { runsInProgress } from "@/db/queries/calibration-runs";
import { calibrationCompliance } from "@/db/queries/calibration-compliance";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { CalibrationBadge } from "@/components/tanks/state-badge";
import { ComplianceView } from "@/components/calibration/compliance-view";
import { ReportDownload, defaultReportPeriod } from "@/components/calibration/report-download";
import { formatDateTime } from "@/lib/display/time";
import { KIND_LABEL } from "@/components/calibration/probe-options";

export const metadata: Metadata = { title: "Calibrations" };
export const dynamic = "force-dynamic";

const linkButton = "inline-flex h-11 items-center gap-2 rounded-md px-4 text-sm font-medium";

export default async function CalibrationsPage() {
  const user = (await currentUser())!;
  const db = getDb();
  const now = requestNow();
  const canChange = user.role !== "night_manager";
  const [tanks, open, compliance] = await Promise.all([
    tankOverview(db, user.orgId, { now }),
    runsInProgress(db, user.orgId),
    user.role === "owner" ? calibrationCompliance(db, user.orgId, now) : Promise.resolve(null),
  ]);
  const rows = tanks.flatMap((t) => t.probes.filter((p) => p.kind !== "temp").map((p) => ({ tank: t, probe: p })));
  const order = { lapsed: 0, never: 1, "due-soon": 2, current: 3, "not-needed": 4 } as const;
  rows.sort((a, b) => order[a.probe.calibration.status] - order[b.probe.calibration.status] || (a.probe.calibration.dueAt ?? 0) - (b.probe.calibration.dueAt ?? 0));
  return (
    <>
      <PageHeader
        title="Calibrations"
        subtitle="Every pH and EC probe, most urgent first"
        actions={
          canChange ? (
            <>
              <Link href="/calibrations/new" className={`${linkButton} bg-accent-700 text-white hover:bg-accent-800`}>
                <FlaskConical className="size-4" aria-hidden /> Start a calibration
              </Link>
              <Link href="/calibrations/manual" className={`${linkButton} border border-paper-line bg-paper-raised hover:bg-paper-sunk`}>
                <ClipboardPen className="size-4" aria-hidden /> Enter one done elsewhere
              </Link>
              <Link href="/calibrations/spot-checks" className={`${linkButton} border border-paper-line bg-paper-raised hover:bg-paper-sunk`}>
                <Gauge className="size-4" aria-hidden /> Spot checks
              </Link>
            </>
          ) : null
        }
      />
      {open.length ? (
        <Card className="mb-6 p-4" data-testid="runs-in-progress">
          <h2 className="mb-2 font-semibold">Runs in progress</h2>
          <ul className="space-y-1 text-sm">
            {open.map((r) => (
              <li key={r.id}>
                <Link href={`/calibrations/runs/${r.id}`} className="inline-flex min-h-10 items-center gap-2 font-medium text-accent-700 hover:underline">
                  <PlayCircle className="size-4" aria-hidden /> {canChange ? "Resume" : "Follow"}: {KIND_LABEL[r.probe.kind]} {r.probe.serial} on {r.tank.name}
                </Link>
                <span className="num ml-2 text-xs text-ink-soft">started {formatDateTime(r.startedAt)}</span>
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
      <Card className="mb-6 overflow-x-auto">
        <table className="w-full min-w-[760px] text-sm">
          <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-4 py-3">Status</th>
              <th className="px-4 py-3">Probe</th>
              <th className="px-4 py-3">Tank</th>
              <th className="px-4 py-3">Last accepted</th>
              <th className="px-4 py-3">Due</th>
              <th className="px-4 py-3">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map(({ tank, probe }) => (
              <tr key={probe.id} data-probe={probe.id} className="border-b border-paper-line last:border-0">
                <td className="px-4 py-3">
                  <CalibrationBadge status={probe.calibration.status} />
                  {probe.status === "replace" ? <span className="ml-2 text-xs font-semibold text-bad">replace</span> : null}
                </td>
                <td className="px-4 py-3">
                  <Link className="hover:underline" href={`/probes/${probe.id}`}>
                    <span className="font-medium">{KIND_LABEL[probe.kind]}</span> <code className="font-mono text-xs text-ink-soft">{probe.serial}</code>
                  </Link>
                </td>
                <td className="px-4 py-3">
                  <Link className="hover:underline" href={`/tanks/${tank.id}`}>
                    {tank.name}
                  </Link>
                  <div className="text-xs text-ink-soft">{tank.siteName}</div>
                </td>
                <td className="num px-4 py-3">{formatDateTime(probe.calibration.lastAcceptedAt)}</td>
                <td className="num px-4 py-3">{formatDateTime(probe.calibration.dueAt)}</td>
                <td className="space-x-2 whitespace-nowrap px-4 py-3 text-right">
                  <a href={`/api/reports/probes/${probe.id}`} className="inline-flex h-9 items-center rounded-md px-3 font-medium text-accent-700 hover:bg-paper-sunk" title="The last twelve months' calibration record as a PDF">
                    Record (PDF)
                  </a>
                  {canChange ? (
                    <Link href={`/calibrations/new?tank=${tank.id}&probe=${probe.id}`} className="inline-flex h-9 items-center rounded-md border border-paper-line px-3 font-medium hover:bg-paper-sunk">
                      Calibrate
                    </Link>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
      {compliance ? <ComplianceView sites={compliance} /> : null}
      {compliance ? <SiteReports sites={compliance.map((c) => c.site)} now={now} /> : null}
    </>
  );
}

/** The owner's compliance reports, one form per site. */
function SiteReports({ sites, now }: { sites: { id: number; name: string }[]; now: number }) {
  const period = defaultReportPeriod(now);
  return (
    <section aria-labelledby="site-reports" className="mt-6">
      <h2 id="site-reports" className="mb-1 text-lg font-semibold">
        Compliance reports
      </h2>
      <p className="mb-3 text-sm text-ink-soft">A PDF per site: compliance now, overdue probes, probes marked for replacement, runs per month and every run in the period.</p>
      <div className="grid gap-4 xl:grid-cols-2">
        {sites.map((s) => (
          <Card key={s.id} className="p-4">
            <h3 className="mb-2 font-semibold">{s.name}</h3>
            <ReportDownload action={`/api/reports/sites/${s.id}`} label="Download the PDF" testId={`site-report-${s.id}`} defaultFrom={period.from} defaultTo={period.to} />
          </Card>
        ))}
      </div>
    </section>
  );
}
