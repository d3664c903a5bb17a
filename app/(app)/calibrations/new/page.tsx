import type { Metadata } from "next";
import Link from "next/link";
import { requestNow } from "@/app/_server/clock";
import { currentUser } from "@/app/_server/session";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { sites } from "@/db/schema";
import { eq } from "drizzle-orm";
import { Card, PageHeader } from "@/components/ui/card";
import { CalibrationBadge } from "@/components/tanks/state-badge";
import { SafetyCautions } from "@/components/calibration/safety-cautions";
import { StartRunForm } from "@/components/calibration/start-run-form";
import { KIND_LABEL } from "@/components/calibration/probe-options";

export const metadata: Metadata = { title: "Start a calibration" };
export const dynamic = "force-dynamic";

const STATUS_WORD = { current: "Current", "due-soon": "Due soon", lapsed: "Lapsed", never: "Never calibrated", "not-needed": "" } as const;

export default async function NewCalibrationPage({ searchParams }: { searchParams: Promise<{ tank?: string; probe?: string }> }) {
  const user = (await currentUser())!;
  const sp = await searchParams;
  const tankId = Number(sp.tank) || undefined;
  const tanks = await tankOverview(getDb(), user.orgId, { tankId, now: requestNow() });
  const canChange = user.role !== "night_manager";
  const tank = tankId ? tanks[0] : undefined;

  if (!tank) {
    return (
      <>
        <PageHeader title="Start a calibration" subtitle="Choose the tank whose probe you are calibrating" />
        <Card className="divide-y divide-paper-line">
          {tanks.map((t) => (
            <Link key={t.id} href={`/calibrations/new?tank=${t.id}`} className="flex min-h-14 items-center justify-between gap-3 px-4 py-3 hover:bg-paper">
              <span>
                <span className="font-medium">{t.name}</span>
                <span className="block text-xs text-ink-soft">{t.siteName}</span>
              </span>
              <span className="flex gap-3">
                {t.probes
                  .filter((p) => p.kind !== "temp")
                  .map((p) => (
                    <span key={p.id} className="text-xs text-ink-soft">
                      {KIND_LABEL[p.kind]} <CalibrationBadge status={p.calibration.status} />
                    </span>
                  ))}
              </span>
            </Link>
          ))}
        </Card>
      </>
    );
  }

  const [site] = await getDb().select({ maxHoldMinutes: sites.maxHoldMinutes }).from(sites).where(eq(sites.id, tank.siteId));
  const probes = tank.probes
    .filter((p): p is typeof p & { kind: "ph" | "ec" } => p.kind !== "temp" && p.status !== "retired")
    .map((p) => ({ id: p.id, kind: p.kind, serial: p.serial, statusLabel: `Calibration: ${STATUS_WORD[p.calibration.status]}${p.status === "replace" ? " · marked for replacement" : ""}` }));
  return (
    <>
      <PageHeader title={`Calibrate a probe on ${tank.name}`} subtitle={`${tank.siteName} · ${tank.crop}`} />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <Card className="p-5">
          {canChange ? (
            <StartRunForm tankId={tank.id} probes={probes} initialProbeId={Number(sp.probe) || undefined} maxHoldMinutes={site?.maxHoldMinutes ?? 240} />
          ) : (
            <p className="text-ink-soft">Your role can follow calibrations but not run them. A grower or the owner starts calibration runs.</p>
          )}
        </Card>
        <div className="self-start">
          <SafetyCautions />
        </div>
      </div>
    </>
  );
}
