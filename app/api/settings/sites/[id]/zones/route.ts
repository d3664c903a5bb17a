import { getDb } from "@/db/client";
import { createZone, siteOfOrg } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded, idParam } from "@/app/_server/guard";
import { renameZoneSchema } from "@/lib/settings/schemas";
import { bodyOf } from "../../../_shared/body";

export const POST = guarded({ roles: OWNER_ONLY, action: "add zones", params: idParam, status: 201 }, async ({ user, params, req }) => {
  await siteOfOrg(getDb(), user.orgId, params.id);
  const { name } = await bodyOf(req, renameZoneSchema);
  return { zone: await createZone(getDb(), user, params.id, name) };
});
