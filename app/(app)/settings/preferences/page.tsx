import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { getPreferences } from "@/db/queries/settings-preferences";
import { Card, PageHeader } from "@/components/ui/card";
import { PreferencesForm } from "@/components/settings/preferences-form";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Preferences" };
export const dynamic = "force-dynamic";

export default async function PreferencesPage() {
  const user = await userForSection("preferences");
  const preferences = await getPreferences(getDb(), user.id);
  return (
    <>
      <PageHeader title="Preferences" subtitle={`Yours only, ${user.name}: how Tidewell shows EC and how it reaches you`} />
      <Card className="max-w-xl p-4">
        <PreferencesForm preferences={preferences} />
      </Card>
    </>
  );
}
