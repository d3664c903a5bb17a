import { getDb } from "@/db/client";
import { findInvitee } from "@/db/queries/settings-users";
import { mailInvitation } from "@/db/queries/settings-invitations";
import { OWNER_ONLY, guarded, idParam } from "@/app/_server/guard";

/** Sends the invitation again (a fresh link; the old one still works once until it expires). */
export const POST = guarded({ roles: OWNER_ONLY, action: "invite users", params: idParam }, async ({ user, params }) => {
  const invitee = await findInvitee(getDb(), user.orgId, params.id);
  return mailInvitation(getDb(), invitee, user.name);
});
