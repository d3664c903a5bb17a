"use client";
import { useMemo, useState } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import { Ban, CircleCheck, Plus, RefreshCw } from "lucide-react";
import { registerDeviceAction, revokeDeviceAction, rotateDeviceAction } from "@/app/(app)/settings/devices/actions";
import type { DeviceRow, IssuedCredentials } from "@/db/queries/settings-devices";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { DataTable } from "@/components/ui/data-table";
import { Dialog } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { formatDateTime } from "@/lib/display/time";
import { registerDeviceSchema } from "@/lib/settings/schemas";
import { DeviceCredentials } from "./device-credentials";
import { FormError, SubmitButton } from "./form-bits";
import type { TankChoice } from "./probe-forms";
import { runAction, useServerForm } from "./use-server-form";

function RegisterForm({ tanks, onIssued }: { tanks: TankChoice[]; onIssued: (c: IssuedCredentials) => void }) {
  const { form, onSubmit } = useServerForm({
    schema: registerDeviceSchema,
    defaultValues: { tankId: tanks[0]?.id ?? 0, controllerId: "" },
    action: registerDeviceAction,
    success: (d) => `Controller ${d.controllerId} registered.`,
    onSuccess: (d) => onIssued(d),
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Register a controller">
      <Field label="Tank" error={errors.tankId?.message} hint="Only tanks without a controller are listed.">
        {(c) => <Select {...c} {...form.register("tankId", { setValueAs: Number })} options={tanks.map((t) => ({ value: String(t.id), label: `${t.name} · ${t.siteName}` }))} />}
      </Field>
      <Field label="Controller id" error={errors.controllerId?.message} hint="The id the controller publishes under, for example ctl-house3-t1.">
        {(c) => <Input {...c} {...form.register("controllerId")} autoComplete="off" autoCapitalize="none" spellCheck={false} />}
      </Field>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting} pendingLabel="Registering…">
        Register and issue credentials
      </SubmitButton>
    </form>
  );
}

export function DevicesEditor({ devices, freeTanks, brokerUrl }: { devices: DeviceRow[]; freeTanks: TankChoice[]; brokerUrl: string }) {
  const [registering, setRegistering] = useState(false);
  const [issued, setIssued] = useState<IssuedCredentials | null>(null);
  const columns = useMemo<ColumnDef<DeviceRow, unknown>[]>(
    () => [
      { id: "controller", accessorFn: (d) => d.controllerId, header: "Controller", cell: ({ getValue }) => <code className="font-mono text-sm">{String(getValue())}</code> },
      { id: "username", accessorFn: (d) => d.username, header: "Username", cell: ({ getValue }) => <code className="font-mono text-xs text-ink-soft">{String(getValue())}</code> },
      { id: "tank", accessorFn: (d) => d.tankName ?? "—", header: "Tank", cell: ({ row }) => <span>{row.original.tankName ?? "—"} {row.original.siteName ? <span className="text-xs text-ink-soft">· {row.original.siteName}</span> : null}</span> },
      {
        id: "status",
        accessorFn: (d) => (d.revokedAt ? "Revoked" : "Active"),
        header: "Credentials",
        meta: { filter: "select", label: "Credentials" },
        cell: ({ row }) =>
          row.original.revokedAt ? (
            <span className="inline-flex items-center gap-1 text-sm font-medium text-bad">
              <Ban className="size-4" aria-hidden /> Revoked <span className="num font-normal text-ink-soft">{formatDateTime(row.original.revokedAt)}</span>
            </span>
          ) : (
            <span className="inline-flex items-center gap-1 text-sm font-medium text-ok">
              <CircleCheck className="size-4" aria-hidden /> Active
            </span>
          ),
      },
      { id: "created", accessorFn: (d) => d.createdAt, header: "Registered", cell: ({ getValue }) => <span className="num">{formatDateTime(getValue() as number)}</span> },
      {
        id: "actions",
        header: "",
        enableSorting: false,
        cell: ({ row }) => {
          const d = row.original;
          if (d.revokedAt) return null;
          return (
            <div className="flex justify-end gap-1">
              <ConfirmDialog
                title={`Rotate the secret of ${d.controllerId}?`}
                description="A new secret is issued; the controller is disconnected within seconds and cannot reconnect until it has the new secret."
                confirmLabel="Rotate secret"
                onConfirm={async () => {
                  const c = await runAction(() => rotateDeviceAction({ id: d.id }), (c) => `New secret issued for ${c.controllerId}.`);
                  if (c) setIssued(c);
                  return Boolean(c);
                }}
                trigger={(open) => (
                  <Button variant="secondary" size="sm" className="h-10" onClick={open} aria-label={`Rotate ${d.controllerId}`}>
                    <RefreshCw className="size-4" aria-hidden /> Rotate
                  </Button>
                )}
              />
              <ConfirmDialog
                title={`Revoke ${d.controllerId}?`}
                description={<>The controller is disconnected within seconds and refused from then on; its tank stops receiving readings until a controller is registered again.</>}
                confirmLabel="Revoke credentials"
                onConfirm={async () => Boolean(await runAction(() => revokeDeviceAction({ id: d.id }), (r) => `Credentials of ${r.controllerId} revoked.`))}
                trigger={(open) => (
                  <Button variant="ghost" size="sm" className="h-10 text-bad" onClick={open} aria-label={`Revoke ${d.controllerId}`}>
                    <Ban className="size-4" aria-hidden /> Revoke
                  </Button>
                )}
              />
            </div>
          );
        },
      },
    ],
    [],
  );
  return (
    <>
      <div className="mb-4">
        <Button onClick={() => setRegistering(true)} disabled={freeTanks.length === 0}>
          <Plus className="size-4" aria-hidden /> Register controller
        </Button>
        {freeTanks.length === 0 ? <p className="mt-2 text-sm text-ink-soft">Every tank has a controller. Add a tank, or revoke a controller first.</p> : null}
      </div>
      <DataTable testId="devices" columns={columns} data={devices} rowId={(d) => String(d.id)} searchPlaceholder="Search controllers" />
      <Dialog open={registering} onClose={() => setRegistering(false)} title="Register a controller">
        <RegisterForm
          tanks={freeTanks}
          onIssued={(c) => {
            setRegistering(false);
            setIssued(c);
          }}
        />
      </Dialog>
      <Dialog open={issued !== null} onClose={() => setIssued(null)} title={issued ? `Credentials for ${issued.controllerId}` : ""}>
        {issued ? <DeviceCredentials credentials={issued} brokerUrl={brokerUrl} onDone={() => setIssued(null)} /> : null}
      </Dialog>
    </>
  );
}
