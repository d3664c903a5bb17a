"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import { findInvitee, inviteUser, updateUser } from "@/db/queries/settings-users";
import { mailInvitation } from "@/db/queries/settings-invitations";
import { renameOrganisation } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guardedAction } from "@/app/_server/guard";
import { inviteUserSchema, organisationSchema, updateUserSchema } from "@/lib/settings/schemas";

const done = <T>(value: T) => {
  revalidatePath("/settings", "layout");
  return value;
};

export const inviteUserAction = guardedAction({ roles: OWNER_ONLY, action: "invite users", input: inviteUserSchema }, async (input, user) => {
  return done(await inviteUser(getDb(), user, input));
});

export const resendInvitationAction = guardedAction({ roles: OWNER_ONLY, action: "invite users", input: z.object({ id: z.number().int().positive() }) }, async ({ id }, user) => {
  const invitee = await findInvitee(getDb(), user.orgId, id);
  return { email: invitee.email, ...(await mailInvitation(getDb(), invitee, user.name)) };
});

export const updateUserAction = guardedAction(
  { roles: OWNER_ONLY, action: "change users", input: z.object({ id: z.number().int().positive(), change: updateUserSchema }) },
  async ({ id, change }, user) => {
    const u = await updateUser(getDb(), user, id, change);
    return done({ name: u.name, role: u.role, active: u.active });
  },
);

export const renameOrganisationAction = guardedAction({ roles: OWNER_ONLY, action: "change the organisation", input: organisationSchema }, async (input, user) =>
  done({ name: (await renameOrganisation(getDb(), user, input)).name }),
);
