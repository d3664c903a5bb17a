import { getDb } from "@/db/client";
import { listUsers } from "@/db/queries/settings-users";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";

export const GET = guarded({ roles: OWNER_ONLY, action: "list users" }, async ({ user }) => ({
  users: (await listUsers(getDb(), user.orgId)).map(({ id, email, name, role, active, status }) => ({ id, email, name, role, active, status })),
}));
