import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { requestNow } from "@/app/_server/clock";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { SpotCheckForm, SpotCheckImport } from "@/components/calibration/spot-check-forms";
import { probeOptions } from "../_probe-options";

export const metadata: Metadata = { title: "Spot checks" };
export const dynamic = "force-dynamic";

export default async function SpotChecksPage({ searchParams }: { searchParams: Promise<{ probe?: string }> }) {
  const user = (await currentUser())!;
  if (user.role === "night_manager") redirect("/calibrations");
  const probes = await probeOptions(user.orgId);
  const initial = Number((await searchParams).probe) || undefined;
  return (
    <>
      <PageHeader title="Spot checks" subtitle="A handheld meter's reading compared with Tidewell's corrected reading at that time (nearest within ±2 min)" />
      <div className="grid max-w-5xl gap-6">
        <Card className="p-5">
          <h2 className="mb-3 font-semibold">One reading</h2>
          <SpotCheckForm probes={probes} initialProbeId={initial} ecUnit={user.ecUnit} now={requestNow()} />
        </Card>
        <Card className="p-5">
          <h2 className="mb-3 font-semibold">Import a CSV of readings</h2>
          <SpotCheckImport />
        </Card>
      </div>
    </>
  );
}
