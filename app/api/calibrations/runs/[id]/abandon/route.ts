import { getDb } from "@/db/client";
import { abandonRun } from "@/db/queries/calibration-runs";
import { CAN_CHANGE, guarded, idParam } from "@/app/_server/guard";

/** Abandons a run in progress; nothing takes effect. */
export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", params: idParam }, async ({ user, params }) => {
  await abandonRun(getDb(), user, params.id);
  return { ok: true };
});
