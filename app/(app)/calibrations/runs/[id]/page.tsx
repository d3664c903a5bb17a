import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { currentUser } from "@/app/_server/session";
import { getDb } from "@/db/client";
import { runInOrg } from "@/db/queries/calibration-scope";
import { ApiError } from "@/app/_server/errors";
import { PageHeader } from "@/components/ui/card";
import { RunWizard } from "@/components/calibration/run-wizard";

export const metadata: Metadata = { title: "Calibration run" };
export const dynamic = "force-dynamic";

export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const user = (await currentUser())!;
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const scope = await runInOrg(getDb(), user.orgId, id).catch((e: unknown) => {
    if (e instanceof ApiError && e.status === 404) return null;
    throw e;
  });
  if (!scope) notFound();
  const { probe, tank, run } = scope;
  return (
    <>
      <PageHeader
        title={`${probe.kind === "ph" ? "pH" : "EC"} calibration · ${tank.name}`}
        subtitle={
          <>
            Probe <code className="font-mono">{probe.serial}</code> · run {run.id} ·{" "}
            <Link className="underline" href={`/probes/${probe.id}`}>
              probe record
            </Link>
          </>
        }
      />
      <RunWizard runId={run.id} canChange={user.role !== "night_manager"} demo={process.env.TIDEWELL_DEMO === "1"} />
    </>
  );
}
