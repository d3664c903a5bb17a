"use client";
import { useMemo } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import { CircleCheck, CircleDashed, CircleSlash, Mail } from "lucide-react";
import { resendInvitationAction, updateUserAction } from "@/app/(app)/settings/users/actions";
import type { UserRow, UserStatus } from "@/db/queries/settings-users";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { DataTable } from "@/components/ui/data-table";
import { Select } from "@/components/ui/select";
import { ROLE_NAMES } from "@/lib/settings/enums";
import type { Role } from "@/db/schema";
import { ROLE_OPTIONS } from "./role-options";
import { runAction } from "./use-server-form";

const STATUS: Record<UserStatus, { label: string; icon: typeof CircleCheck; cls: string }> = {
  active: { label: "Active", icon: CircleCheck, cls: "text-ok" },
  invited: { label: "Invited", icon: Mail, cls: "text-held" },
  deactivated: { label: "Deactivated", icon: CircleSlash, cls: "text-ink-soft" },
};

export function StatusBadge({ status }: { status: UserStatus }) {
  const { label, icon: Icon, cls } = STATUS[status] ?? { label: status, icon: CircleDashed, cls: "" };
  return (
    <span data-status={status} className={cn("inline-flex items-center gap-1 text-sm font-medium", cls)}>
      <Icon className="size-4" aria-hidden /> {label}
    </span>
  );
}

export function UsersTable({ users, selfId }: { users: UserRow[]; selfId: number }) {
  const columns = useMemo<ColumnDef<UserRow, unknown>[]>(
    () => [
      {
        id: "name",
        // Name and e-mail together, so the search box finds either; sorts by name.
        accessorFn: (u) => `${u.name} ${u.email}`,
        header: "Name",
        cell: ({ row }) => (
          <div>
            <div className="font-medium">
              {row.original.name}
              {row.original.id === selfId ? <span className="ml-1 text-xs font-normal text-ink-soft">(you)</span> : null}
            </div>
            <div className="text-xs text-ink-soft">{row.original.email}</div>
          </div>
        ),
      },
      {
        id: "role",
        accessorFn: (u) => ROLE_NAMES[u.role],
        header: "Role",
        meta: { filter: "select", label: "Role" },
        cell: ({ row }) => (
          <Select
            aria-label={`Role of ${row.original.name}`}
            defaultValue={row.original.role}
            disabled={row.original.status === "deactivated"}
            options={ROLE_OPTIONS}
            className="h-10 w-44"
            onChange={async (e) => {
              const role = e.target.value as Role;
              const ok = await runAction(() => updateUserAction({ id: row.original.id, change: { role } }), (d) => `${d.name} is now ${ROLE_NAMES[d.role].toLowerCase()}.`);
              if (!ok) e.target.value = row.original.role;
            }}
          />
        ),
      },
      { id: "status", accessorFn: (u) => STATUS[u.status].label, header: "Status", meta: { filter: "select", label: "Status" }, cell: ({ row }) => <StatusBadge status={row.original.status} /> },
      {
        id: "actions",
        header: "",
        enableSorting: false,
        cell: ({ row }) => {
          const u = row.original;
          return (
            <div className="flex justify-end gap-2">
              {u.status === "invited" ? (
                <Button variant="secondary" size="sm" className="h-10" onClick={() => runAction(() => resendInvitationAction({ id: u.id }), (d) => (d.mailed ? `Invitation sent again to ${d.email}.` : "The e-mail could not be sent."))}>
                  Send again
                </Button>
              ) : null}
              {u.active ? (
                <ConfirmDialog
                  title={`Deactivate ${u.name}?`}
                  description={<>They are signed out at once and can no longer sign in. Their past records (calibrations, acknowledgements) stay. You can restore them later.</>}
                  confirmLabel="Deactivate"
                  onConfirm={async () => Boolean(await runAction(() => updateUserAction({ id: u.id, change: { active: false } }), (d) => `${d.name} is deactivated.`))}
                  trigger={(open) => (
                    <Button variant="ghost" size="sm" className="h-10 text-bad" onClick={open}>
                      Deactivate
                    </Button>
                  )}
                />
              ) : (
                <Button variant="secondary" size="sm" className="h-10" onClick={() => runAction(() => updateUserAction({ id: u.id, change: { active: true } }), (d) => `${d.name} is restored.`)}>
                  Restore
                </Button>
              )}
            </div>
          );
        },
      },
    ],
    [selfId],
  );
  return <DataTable testId="users" columns={columns} data={users} rowId={(u) => String(u.id)} searchPlaceholder="Search people" initialSorting={[{ id: "name", desc: false }]} />;
}
