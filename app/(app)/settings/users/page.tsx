import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listUsers } from "@/db/queries/settings-users";
import { getOrganisation } from "@/db/queries/settings-sites";
import { Card, PageHeader } from "@/components/ui/card";
import { InviteForm } from "@/components/settings/invite-form";
import { OrganisationForm } from "@/components/settings/organisation-form";
import { UsersTable } from "@/components/settings/users-table";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Organisation & users" };
export const dynamic = "force-dynamic";

export default async function UsersSettingsPage() {
  const user = await userForSection("users");
  const [org, users] = await Promise.all([getOrganisation(getDb(), user.orgId), listUsers(getDb(), user.orgId)]);
  return (
    <>
      <PageHeader title="Organisation & users" subtitle="Invite people by e-mail, choose their role, deactivate those who leave" />
      <div className="grid gap-6 xl:grid-cols-[22rem_minmax(0,1fr)]">
        <div className="space-y-6">
          <Card className="p-4">
            <h2 className="mb-3 font-semibold">Farm</h2>
            <OrganisationForm name={org.name} />
          </Card>
          <Card className="p-4">
            <h2 className="mb-1 font-semibold">Invite someone</h2>
            <p className="mb-3 text-sm text-ink-soft">They get an e-mail with a link (valid 72 hours, once) to choose their password.</p>
            <InviteForm />
          </Card>
        </div>
        <section aria-label="Users">
          <UsersTable users={users} selfId={user.id} />
        </section>
      </div>
    </>
  );
}
