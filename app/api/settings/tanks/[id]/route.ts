import { getDb } from "@/db/client";
import { tankOfOrg, updateTank } from "@/db/queries/settings-tanks";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";
import { tankSchema } from "@/lib/settings/schemas";

export const PUT = guarded({ roles: CAN_CHANGE, action: "change tanks and targets", params: idParam }, async ({ user, params, req }) => {
  await tankOfOrg(getDb(), user.orgId, params.id);
  return { tank: await updateTank(getDb(), user, params.id, await parseBody(req, tankSchema)) };
});
