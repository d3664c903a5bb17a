import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listSites } from "@/db/queries/settings-sites";
import { listTankSettings } from "@/db/queries/settings-tanks";
import { PageHeader } from "@/components/ui/card";
import { TanksEditor } from "@/components/settings/tanks-editor";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Tank settings" };
export const dynamic = "force-dynamic";

export default async function TanksSettingsPage() {
  const user = await userForSection("tanks");
  const [tanks, sites] = await Promise.all([listTankSettings(getDb(), user.orgId), listSites(getDb(), user.orgId)]);
  return (
    <>
      <PageHeader title="Tanks" subtitle="Crop and target band, temperature compensation, spot-check tolerance and calibration interval per tank" />
      <TanksEditor tanks={tanks} sites={sites} ecUnit={user.ecUnit} />
    </>
  );
}
