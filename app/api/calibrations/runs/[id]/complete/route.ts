import { z } from "zod";
import { getDb } from "@/db/client";
import { completeRun } from "@/db/queries/calibration-runs";
import { runInOrg } from "@/db/queries/calibration-scope";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";
import { announceCalibration } from "../../../_lib/announce";
import { KIND_LABEL } from "@/components/calibration/probe-options";

/** Saves the verdict; an accepted calibration is in force from now, or from the typed time a run entered late was done. */
export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", params: idParam }, async ({ user, params, req }) => {
  const db = getDb();
  const { tank, probe } = await runInOrg(db, user.orgId, params.id);
  const body = await parseBody(req, z.object({ note: z.string().trim().max(1000).optional(), effectiveAt: z.number().int().positive().optional() }));
  const now = Date.now();
  const saved = await completeRun(db, user, params.id, body, now);
  const announced = await announceCalibration({
    orgId: user.orgId,
    tankId: tank.id,
    runId: saved.run.id,
    at: now,
    summary: `${tank.name}: ${KIND_LABEL[probe.kind]} probe ${probe.serial} calibration ${saved.fit.verdict}`,
  });
  return { ...saved, announced };
});
