import { getDb } from "@/db/client";
import { deviceOfOrg, rotateDeviceSecret } from "@/db/queries/settings-devices";
import { OWNER_ONLY, guarded, idParam, parseBody } from "@/app/_server/guard";
import { deviceCredentialChangeSchema } from "@/lib/settings/schemas";

export const POST = guarded({ roles: OWNER_ONLY, action: "rotate device credentials", params: idParam }, async ({ user, params, req }) => {
  await deviceOfOrg(getDb(), user.orgId, params.id);
  await parseBody(req, deviceCredentialChangeSchema);
  return { credentials: await rotateDeviceSecret(getDb(), user, params.id) };
});
