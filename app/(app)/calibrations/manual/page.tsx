import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { requestNow } from "@/app/_server/clock";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { ManualEntryForm } from "@/components/calibration/manual-entry-form";
import { probeOptions } from "../_probe-options";

export const metadata: Metadata = { title: "Enter a calibration" };
export const dynamic = "force-dynamic";

export default async function ManualCalibrationPage() {
  const user = (await currentUser())!;
  if (user.role === "night_manager") redirect("/calibrations");
  return (
    <>
      <PageHeader title="Enter a calibration done elsewhere" subtitle="A handheld meter's calibration or another technician's log, with the buffer lots and the certificate" />
      <Card className="max-w-3xl p-5">
        <ManualEntryForm probes={await probeOptions(user.orgId)} now={requestNow()} />
      </Card>
    </>
  );
}
