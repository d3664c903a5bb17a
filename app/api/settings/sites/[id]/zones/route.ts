import { getDb } from "@/db/client";
import { createZone, siteOfOrg } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded, idParam, parseBody } from "@/app/_server/guard";
import { renameZoneSchema } from "@/lib/settings/schemas";

export const POST = guarded({ roles: OWNER_ONLY, action: "add zones", params: idParam, status: 201 }, async ({ user, params, req }) => {
  await siteOfOrg(getDb(), user.orgId, params.id);
  const { name } = await parseBody(req, renameZoneSchema);
  return { zone: await createZone(getDb(), user, params.id, name) };
});
