import { getDb } from "@/db/client";
import { createSite, listSites } from "@/db/queries/settings-sites";
import { CAN_CHANGE, OWNER_ONLY, guarded } from "@/app/_server/guard";
import { siteSchema } from "@/lib/settings/schemas";

// Growers read sites (to place tanks); only the owner changes them.
export const GET = guarded({ roles: CAN_CHANGE, action: "see site settings" }, async ({ user }) => ({ sites: await listSites(getDb(), user.orgId) }));

export const POST = guarded({ roles: OWNER_ONLY, action: "add sites", body: siteSchema, status: 201 }, async ({ user, body }) => ({ site: await createSite(getDb(), user, body) }));
