import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listSites } from "@/db/queries/settings-sites";
import { PageHeader } from "@/components/ui/card";
import { SitesEditor } from "@/components/settings/sites-editor";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Sites & zones" };
export const dynamic = "force-dynamic";

export default async function SitesSettingsPage() {
  const user = await userForSection("sites");
  const sites = await listSites(getDb(), user.orgId);
  const timeZones = ["UTC", ...Intl.supportedValuesOf("timeZone").filter((z) => z !== "UTC")];
  return (
    <>
      <PageHeader title="Sites & zones" subtitle="Each site's time zone and shifts decide who is paged; its limits cap calibration intervals and holds" />
      <SitesEditor sites={sites} timeZones={timeZones} />
    </>
  );
}
