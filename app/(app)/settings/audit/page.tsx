import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listAudit } from "@/db/queries/audit";
import { PageHeader } from "@/components/ui/card";
import { AuditTable } from "@/components/settings/audit-table";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Audit log" };
export const dynamic = "force-dynamic";

const SHOWN = 2000;

export default async function AuditPage() {
  const user = await userForSection("audit");
  const entries = await listAudit(getDb(), user.orgId, { limit: SHOWN });
  return (
    <>
      <PageHeader title="Audit log" subtitle={`Who changed what and when: settings, holds, calibrations and incidents (latest ${SHOWN})`} />
      <AuditTable entries={entries} />
    </>
  );
}
