import type { Metadata } from "next";
import Link from "next/link";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { currentUser } from "@/app/_server/session";
import { Card, NotBuiltYet, PageHeader } from "@/components/ui/card";
import { CalibrationBadge } from "@/components/tanks/state-badge";
import { formatDateTime } from "@/lib/display/time";

export const metadata: Metadata = { title: "Calibrations" };
export const dynamic = "force-dynamic";

export default async function CalibrationsPage() {
  const user = (await currentUser())!;
  const tanks = await tankOverview(getDb(), user.orgId);
  const rows = tanks.flatMap((t) => t.probes.filter((p) => p.kind !== "temp").map((p) => ({ tank: t, probe: p })));
  const order = { lapsed: 0, never: 1, "due-soon": 2, current: 3, "not-needed": 4 } as const;
  rows.sort((a, b) => order[a.probe.calibration.status] - order[b.probe.calibration.status] || (a.probe.calibration.dueAt ?? 0) - (b.probe.calibration.dueAt ?? 0));
  return (
    <>
      <PageHeader title="Calibrations" subtitle="Every pH and EC probe, most urgent first" />
      <Card className="mb-6 overflow-x-auto">
        <table className="w-full min-w-[720px] text-sm">
          <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-4 py-3">Status</th>
              <th className="px-4 py-3">Probe</th>
              <th className="px-4 py-3">Tank</th>
              <th className="px-4 py-3">Last accepted</th>
              <th className="px-4 py-3">Due</th>
            </tr>
          </thead>
          <tbody>
            {rows.map(({ tank, probe }) => (
              <tr key={probe.id} className="border-b border-paper-line last:border-0">
                <td className="px-4 py-3">
                  <CalibrationBadge status={probe.calibration.status} />
                </td>
                <td className="px-4 py-3">
                  <span className="font-medium uppercase">{probe.kind}</span> <code className="font-mono text-xs text-ink-soft">{probe.serial}</code>
                </td>
                <td className="px-4 py-3">
                  <Link className="hover:underline" href={`/tanks/${tank.id}`}>
                    {tank.name}
                  </Link>
                  <div className="text-xs text-ink-soft">{tank.siteName}</div>
                </td>
                <td className="num px-4 py-3">{formatDateTime(probe.calibration.lastAcceptedAt)}</td>
                <td className="num px-4 py-3">{formatDateTime(probe.calibration.dueAt)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
      <NotBuiltYet what="The guided calibration run, manual entries and spot checks" />
    </>
  );
}
