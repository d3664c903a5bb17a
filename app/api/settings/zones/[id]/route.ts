import { z } from "zod";
import { getDb } from "@/db/client";
import { deleteZone, renameZone, zoneOfOrg } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded, idParam, parseBody } from "@/app/_server/guard";
import { renameZoneSchema } from "@/lib/settings/schemas";

export const PATCH = guarded({ roles: OWNER_ONLY, action: "change zones", params: idParam }, async ({ user, params, req }) => {
  await zoneOfOrg(getDb(), user.orgId, params.id);
  const { name } = await parseBody(req, renameZoneSchema);
  return { zone: await renameZone(getDb(), user, params.id, name) };
});

const confirmDelete = z.object({ confirm: z.literal(true, { error: "Confirm this change (send confirm: true)." }) });

export const DELETE = guarded({ roles: OWNER_ONLY, action: "delete zones", params: idParam }, async ({ user, params, req }) => {
  await zoneOfOrg(getDb(), user.orgId, params.id);
  await parseBody(req, confirmDelete);
  return { zone: await deleteZone(getDb(), user, params.id) };
});
