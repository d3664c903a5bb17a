import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";

export const GET = guarded({ roles: OWNER_ONLY, action: "list users" }, async ({ user }) => ({
  users: await getDb()
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active })
    .from(users)
    .where(eq(users.orgId, user.orgId)),
}));
