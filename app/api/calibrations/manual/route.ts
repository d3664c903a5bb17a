import { z } from "zod";
import { getDb } from "@/db/client";
import { createManualCalibration } from "@/db/queries/calibration-manual";
import { probeInOrg } from "@/db/queries/calibration-scope";
import { CAN_CHANGE, guarded } from "@/app/_server/guard";
import { announceCalibration } from "../_lib/announce";
import { KIND_LABEL } from "@/components/calibration/probe-options";

const manualBody = z.object({
  probeId: z.number().int().positive(),
  performedAt: z.number().int().positive(),
  slopePct: z.number().min(0).max(200).optional(),
  offsetMv: z.number().min(-500).max(500).optional(),
  cellConstant: z.number().positive().max(100).optional(),
  standards: z
    .array(
      z.object({
        standard: z.string().trim().min(1).max(2000),
        lot: z.string().trim().min(1, "Enter the lot from the bottle").max(60),
        expiresOn: z.iso.date("Enter the expiry date as YYYY-MM-DD"),
        tempC: z.number().min(0).max(60).optional(),
      }),
    )
    .min(1, "Record at least one buffer or standard with its lot")
    .max(3),
  note: z.string().trim().max(2000).optional(),
  uploadId: z.number().int().positive().optional(),
});

/** Records a calibration done elsewhere (a handheld meter, another technician's log). */
export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", body: manualBody, status: 201 }, async ({ user, body }) => {
  const db = getDb();
  const { run, recomputed } = await createManualCalibration(db, user, body);
  const { tank, probe } = await probeInOrg(db, user.orgId, body.probeId);
  const announced = await announceCalibration({ orgId: user.orgId, tankId: tank.id, runId: run.id, at: Date.now(), summary: `${tank.name}: ${KIND_LABEL[probe.kind]} probe ${probe.serial} calibration entered by hand (${run.status})` });
  return { run, recomputed, announced };
});
