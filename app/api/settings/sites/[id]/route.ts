import { getDb } from "@/db/client";
import { siteOfOrg, updateSite } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded, idParam, parseBody } from "@/app/_server/guard";
import { siteSchema } from "@/lib/settings/schemas";

export const PUT = guarded({ roles: OWNER_ONLY, action: "change sites", params: idParam }, async ({ user, params, req }) => {
  await siteOfOrg(getDb(), user.orgId, params.id);
  return { site: await updateSite(getDb(), user, params.id, await parseBody(req, siteSchema)) };
});
