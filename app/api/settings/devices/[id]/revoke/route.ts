import { getDb } from "@/db/client";
import { deviceOfOrg, revokeDevice } from "@/db/queries/settings-devices";
import { OWNER_ONLY, guarded, idParam, parseBody } from "@/app/_server/guard";
import { deviceCredentialChangeSchema } from "@/lib/settings/schemas";

export const POST = guarded({ roles: OWNER_ONLY, action: "revoke device credentials", params: idParam }, async ({ user, params, req }) => {
  await deviceOfOrg(getDb(), user.orgId, params.id);
  await parseBody(req, deviceCredentialChangeSchema);
  return { device: await revokeDevice(getDb(), user, params.id) };
});
