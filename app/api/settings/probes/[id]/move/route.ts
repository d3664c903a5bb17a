import { getDb } from "@/db/client";
import { moveProbe, probeOfOrg } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guarded, idParam } from "@/app/_server/guard";
import { moveProbeSchema } from "@/lib/settings/schemas";
import { bodyOf } from "../../../_shared/body";

export const POST = guarded({ roles: CAN_CHANGE, action: "move probes", params: idParam }, async ({ user, params, req }) => {
  await probeOfOrg(getDb(), user.orgId, params.id);
  const { tankId } = await bodyOf(req, moveProbeSchema);
  return { probe: await moveProbe(getDb(), user, params.id, tankId) };
});
