import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listSites } from "@/db/queries/settings-sites";
import { listTankSettings } from "@/db/queries/settings-tanks";
import { PageHeader } from "@/components/ui/card";
import { ExportForms } from "@/components/settings/export-forms";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Exports" };
export const dynamic = "force-dynamic";

export default async function ExportsPage() {
  const user = await userForSection("exports");
  const [tanks, sites] = await Promise.all([listTankSettings(getDb(), user.orgId), listSites(getDb(), user.orgId)]);
  return (
    <>
      <PageHeader title="Exports" subtitle="CSV files with full precision: raw signals, corrected values and quality flags; every calibration run with its reasons and lots" />
      <ExportForms tanks={tanks.map((t) => ({ id: t.tank.id, name: t.tank.name, siteName: t.siteName }))} sites={sites.map((s) => ({ id: s.id, name: s.name }))} />
    </>
  );
}
