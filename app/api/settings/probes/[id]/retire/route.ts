import { getDb } from "@/db/client";
import { probeOfOrg, retireProbe } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";
import { retireProbeSchema } from "@/lib/settings/schemas";

export const POST = guarded({ roles: CAN_CHANGE, action: "retire probes", params: idParam }, async ({ user, params, req }) => {
  await probeOfOrg(getDb(), user.orgId, params.id);
  await parseBody(req, retireProbeSchema);
  return { probe: await retireProbe(getDb(), user, params.id) };
});
