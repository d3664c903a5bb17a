import { getDb } from "@/db/client";
import { probeOfOrg, retireProbe } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guarded, idParam } from "@/app/_server/guard";
import { retireProbeSchema } from "@/lib/settings/schemas";
import { bodyOf } from "../../../_shared/body";

export const POST = guarded({ roles: CAN_CHANGE, action: "retire probes", params: idParam }, async ({ user, params, req }) => {
  await probeOfOrg(getDb(), user.orgId, params.id);
  await bodyOf(req, retireProbeSchema);
  return { probe: await retireProbe(getDb(), user, params.id) };
});
