import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listProbeSettings } from "@/db/queries/settings-probes";
import { listTankSettings } from "@/db/queries/settings-tanks";
import { PageHeader } from "@/components/ui/card";
import { ProbesEditor } from "@/components/settings/probes-editor";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Probes" };
export const dynamic = "force-dynamic";

export default async function ProbesSettingsPage() {
  const user = await userForSection("probes");
  const [probes, tanks] = await Promise.all([listProbeSettings(getDb(), user.orgId), listTankSettings(getDb(), user.orgId)]);
  return (
    <>
      <PageHeader title="Probes" subtitle="Every probe ever installed; retired and replaced probes keep their calibration history" />
      <ProbesEditor probes={probes} tanks={tanks.map((t) => ({ id: t.tank.id, name: t.tank.name, siteName: t.siteName }))} />
    </>
  );
}
