import { getDb } from "@/db/client";
import { listAudit } from "@/db/queries/audit";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { auditQuerySchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: OWNER_ONLY, action: "read the audit log", query: auditQuerySchema }, async ({ user, query }) => ({
  entries: await listAudit(getDb(), user.orgId, query),
}));
