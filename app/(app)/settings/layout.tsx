import { currentUser } from "@/app/_server/session";
import { SettingsTabs } from "@/components/settings/settings-tabs";
import { sectionsFor } from "@/lib/settings/sections";

export default async function SettingsLayout({ children }: { children: React.ReactNode }) {
  const user = (await currentUser())!;
  const sections = sectionsFor(user.role);
  return (
    <>
      {sections.length > 1 ? <SettingsTabs sections={sections.map(({ href, title }) => ({ href, title }))} /> : null}
      {children}
    </>
  );
}
