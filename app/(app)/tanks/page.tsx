import { requestNow } from "@/app/_server/clock";
import type { Metadata } from "next";
import Link from "next/link";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { CalibrationBadge, StateBadge } from "@/components/tanks/state-badge";
import { toStateInput } from "@/components/tanks/tank-tile";
import { tankStates } from "@/lib/display/tank-state";
import { formatEc, ecUnitLabel } from "@/lib/display/units";

export const metadata: Metadata = { title: "Tanks" };
export const dynamic = "force-dynamic";

export default async function TanksPage() {
  const user = (await currentUser())!;
  const now = requestNow();
  const tanks = await tankOverview(getDb(), user.orgId, { now });
  return (
    <>
      <PageHeader title="Tanks" subtitle="Every tank with its target band, probes and calibration status" />
      <Card className="overflow-x-auto">
        <table className="w-full min-w-[760px] text-sm">
          <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-4 py-3">Tank</th>
              <th className="px-4 py-3">Site · zone</th>
              <th className="px-4 py-3">State</th>
              <th className="px-4 py-3">pH band</th>
              <th className="px-4 py-3">EC band ({ecUnitLabel(user.ecUnit)})</th>
              <th className="px-4 py-3">pH calibration</th>
              <th className="px-4 py-3">EC calibration</th>
            </tr>
          </thead>
          <tbody>
            {tanks.map((t) => {
              const ph = t.probes.find((p) => p.kind === "ph");
              const ec = t.probes.find((p) => p.kind === "ec");
              return (
                <tr key={t.id} className="border-b border-paper-line last:border-0 hover:bg-paper">
                  <td className="px-4 py-3 font-medium">
                    <Link href={`/tanks/${t.id}`} className="hover:underline">
                      {t.name}
                    </Link>
                    <div className="text-xs text-ink-soft">{t.crop}</div>
                  </td>
                  <td className="px-4 py-3 text-ink-soft">
                    {t.siteName}
                    {t.zoneName ? ` · ${t.zoneName}` : ""}
                  </td>
                  <td className="px-4 py-3">
                    <StateBadge state={tankStates(toStateInput(t, now))[0]} />
                  </td>
                  <td className="num px-4 py-3">
                    {t.band.phMin.toFixed(1)}–{t.band.phMax.toFixed(1)}
                  </td>
                  <td className="num px-4 py-3">
                    {formatEc(t.band.ecMinUs, user.ecUnit)}–{formatEc(t.band.ecMaxUs, user.ecUnit)}
                  </td>
                  <td className="px-4 py-3">{ph ? <CalibrationBadge status={ph.calibration.status} /> : "—"}</td>
                  <td className="px-4 py-3">{ec ? <CalibrationBadge status={ec.calibration.status} /> : "—"}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </Card>
    </>
  );
}
