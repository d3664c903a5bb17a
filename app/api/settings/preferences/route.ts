import { getDb } from "@/db/client";
import { getPreferences, updatePreferences } from "@/db/queries/settings-preferences";
import { ALL_ROLES, guarded } from "@/app/_server/guard";
import { preferencesSchema } from "@/lib/settings/schemas";

// Every role, and always the signed-in user's own preferences.
export const GET = guarded({ roles: ALL_ROLES }, async ({ user }) => ({ preferences: await getPreferences(getDb(), user.id) }));

export const PATCH = guarded({ roles: ALL_ROLES, body: preferencesSchema }, async ({ user, body }) => ({ preferences: await updatePreferences(getDb(), user, body) }));
