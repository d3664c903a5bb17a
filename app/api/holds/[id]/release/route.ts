import { getDb } from "@/db/client";
import { releaseHold } from "@/db/queries/holds";
import { CAN_CHANGE, guarded, idParam } from "@/app/_server/guard";
import { sendDosing } from "../../dosing";

/** Releases a hold by hand and sends the dosing resume; alerts return after the settling period. */
export const POST = guarded({ roles: CAN_CHANGE, action: "release holds", params: idParam }, async ({ user, params }) => {
  const now = Date.now();
  const { hold, tank } = await releaseHold(getDb(), { orgId: user.orgId, user }, params.id, now);
  const dosing = await sendDosing("resume", hold, tank, now);
  return { hold, dosing };
});
