import { getDb } from "@/db/client";
import { createInvitedUser, listUsers } from "@/db/queries/settings-users";
import { mailInvitation } from "@/db/queries/settings-invitations";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { inviteUserSchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: OWNER_ONLY, action: "list users" }, async ({ user }) => ({ users: await listUsers(getDb(), user.orgId) }));

export const POST = guarded({ roles: OWNER_ONLY, action: "invite users", body: inviteUserSchema, status: 201 }, async ({ user, body }) => {
  const invitee = await createInvitedUser(getDb(), user, body);
  const { mailed } = await mailInvitation(getDb(), invitee, user.name);
  return { user: { id: invitee.id, email: invitee.email, name: invitee.name, role: invitee.role, status: "invited" }, mailed };
});
