import { getDb } from "@/db/client";
import { updateUser, userOfOrg } from "@/db/queries/settings-users";
import { OWNER_ONLY, guarded, idParam, parseBody } from "@/app/_server/guard";
import { updateUserSchema } from "@/lib/settings/schemas";

export const PATCH = guarded({ roles: OWNER_ONLY, action: "change users", params: idParam }, async ({ user, params, req }) => {
  await userOfOrg(getDb(), user.orgId, params.id);
  const u = await updateUser(getDb(), user, params.id, await parseBody(req, updateUserSchema));
  return { user: { id: u.id, email: u.email, name: u.name, role: u.role, active: u.active } };
});
