import { getDb } from "@/db/client";
import { moveProbe, probeOfOrg } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";
import { moveProbeSchema } from "@/lib/settings/schemas";

export const POST = guarded({ roles: CAN_CHANGE, action: "move probes", params: idParam }, async ({ user, params, req }) => {
  await probeOfOrg(getDb(), user.orgId, params.id);
  const { tankId } = await parseBody(req, moveProbeSchema);
  return { probe: await moveProbe(getDb(), user, params.id, tankId) };
});
