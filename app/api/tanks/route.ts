import { z } from "zod";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { ALL_ROLES, guarded } from "@/app/_server/guard";

export const GET = guarded({ roles: ALL_ROLES, query: z.object({ site: z.coerce.number().int().positive().optional() }) }, async ({ user, query }) => ({
  tanks: await tankOverview(getDb(), user.orgId, { siteId: query.site }),
}));
