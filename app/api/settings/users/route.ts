import { getDb } from "@/db/client";
import { inviteUser, listUsers } from "@/db/queries/settings-users";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { inviteUserSchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: OWNER_ONLY, action: "list users" }, async ({ user }) => ({ users: await listUsers(getDb(), user.orgId) }));

export const POST = guarded({ roles: OWNER_ONLY, action: "invite users", body: inviteUserSchema, status: 201 }, async ({ user, body }) => {
  // The same answer whether or not the address has an account elsewhere (see inviteUser).
  const { email, mailed } = await inviteUser(getDb(), user, body);
  return { invitation: { email, name: body.name, role: body.role, status: "invited" }, mailed };
});
