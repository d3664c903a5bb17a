import { getDb } from "@/db/client";
import { siteOfOrg, updateSite } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded, idParam } from "@/app/_server/guard";
import { siteSchema } from "@/lib/settings/schemas";
import { bodyOf } from "../../_shared/body";

export const PUT = guarded({ roles: OWNER_ONLY, action: "change sites", params: idParam }, async ({ user, params, req }) => {
  await siteOfOrg(getDb(), user.orgId, params.id);
  return { site: await updateSite(getDb(), user, params.id, await bodyOf(req, siteSchema)) };
});
