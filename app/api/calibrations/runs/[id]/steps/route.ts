import { z } from "zod";
import { getDb } from "@/db/client";
import { confirmStep } from "@/db/queries/calibration-runs";
import { runInOrg } from "@/db/queries/calibration-scope";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";

/** Confirms the clean-and-rinse step, or skips the as-found check. */
export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", params: idParam }, async ({ user, params, req }) => {
  const db = getDb();
  await runInOrg(db, user.orgId, params.id);
  const body = await parseBody(req, z.object({ step: z.enum(["clean", "skip-as-found"]) }));
  await confirmStep(db, user, params.id, body.step);
  return { ok: true };
});
