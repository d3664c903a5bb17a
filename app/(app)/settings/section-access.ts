import { redirect } from "next/navigation";
import { currentUser, type SessionUser } from "@/app/_server/session";
import { maySee, type SettingsSection } from "@/lib/settings/sections";

/** The signed-in user, or a redirect to the Settings index when their role may not open this section. */
export async function userForSection(key: SettingsSection["key"]): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  if (!maySee(user.role, key)) redirect("/settings");
  return user;
}
