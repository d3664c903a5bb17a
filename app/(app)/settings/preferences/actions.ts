"use server";
import { revalidatePath } from "next/cache";
import { getDb } from "@/db/client";
import { updatePreferences } from "@/db/queries/settings-preferences";
import { ALL_ROLES, guardedAction } from "@/app/_server/guard";
import { preferencesSchema } from "@/lib/settings/schemas";

export const updatePreferencesAction = guardedAction({ roles: ALL_ROLES, input: preferencesSchema }, async (input, user) => {
  const preferences = await updatePreferences(getDb(), user, input);
  revalidatePath("/", "layout"); // the EC unit shows on every screen
  return preferences;
});
