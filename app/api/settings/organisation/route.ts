import { getDb } from "@/db/client";
import { getOrganisation, renameOrganisation } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { organisationSchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: OWNER_ONLY, action: "change the organisation" }, async ({ user }) => ({ organisation: await getOrganisation(getDb(), user.orgId) }));

export const PATCH = guarded({ roles: OWNER_ONLY, action: "change the organisation", body: organisationSchema }, async ({ user, body }) => ({
  organisation: await renameOrganisation(getDb(), user, body),
}));
