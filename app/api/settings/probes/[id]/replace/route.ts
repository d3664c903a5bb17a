import { getDb } from "@/db/client";
import { probeOfOrg, replaceProbe } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";
import { replaceProbeSchema } from "@/lib/settings/schemas";

export const POST = guarded({ roles: CAN_CHANGE, action: "replace probes", params: idParam, status: 201 }, async ({ user, params, req }) => {
  await probeOfOrg(getDb(), user.orgId, params.id);
  return { probe: await replaceProbe(getDb(), user, params.id, await parseBody(req, replaceProbeSchema)) };
});
