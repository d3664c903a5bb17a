"use client";
import { useMemo, useState } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import { ArrowRightLeft, Archive, CircleCheck, CircleSlash, Plus, Replace, Wrench } from "lucide-react";
import { retireProbeAction } from "@/app/(app)/settings/probes/actions";
import type { ProbeSettingsRow } from "@/db/queries/settings-probes";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { DataTable } from "@/components/ui/data-table";
import { Dialog } from "@/components/ui/dialog";
import { PROBE_KIND_NAMES } from "@/lib/settings/enums";
import { formatDateTime } from "@/lib/display/time";
import { AddProbeForm, MoveProbeForm, ReplaceProbeForm, type TankChoice } from "./probe-forms";
import { ProbeSafetyNote } from "./safety-note";
import { runAction } from "./use-server-form";

type Probe = ProbeSettingsRow["probe"];
type Editing = { kind: "add" } | { kind: "move" | "replace"; probe: Probe } | null;

const STATUS = {
  active: { label: "In service", icon: CircleCheck, cls: "text-ok" },
  replace: { label: "Due for replacement", icon: Wrench, cls: "text-warn" },
  retired: { label: "Retired", icon: CircleSlash, cls: "text-ink-soft" },
} as const;

export function ProbesEditor({ probes, tanks }: { probes: ProbeSettingsRow[]; tanks: TankChoice[] }) {
  const [editing, setEditing] = useState<Editing>(null);
  const serialOf = useMemo(() => new Map(probes.map((p) => [p.probe.id, p.probe.serial])), [probes]);
  const columns = useMemo<ColumnDef<ProbeSettingsRow, unknown>[]>(
    () => [
      { id: "serial", accessorFn: (r) => r.probe.serial, header: "Serial", cell: ({ getValue }) => <code className="font-mono text-sm">{String(getValue())}</code> },
      { id: "kind", accessorFn: (r) => PROBE_KIND_NAMES[r.probe.kind], header: "Measures", meta: { filter: "select", label: "Measure" } },
      { id: "tank", accessorFn: (r) => r.tankName, header: "Tank", meta: { filter: "select", label: "Tank" }, cell: ({ row }) => <span>{row.original.tankName} <span className="text-xs text-ink-soft">· {row.original.siteName}</span></span> },
      {
        id: "status",
        accessorFn: (r) => STATUS[r.probe.status].label,
        header: "Status",
        meta: { filter: "select", label: "Status" },
        cell: ({ row }) => {
          const s = STATUS[row.original.probe.status];
          const successor = row.original.probe.replacedById ? serialOf.get(row.original.probe.replacedById) : null;
          return (
            <span className={cn("inline-flex items-center gap-1 whitespace-nowrap text-sm font-medium", s.cls)}>
              <s.icon className="size-4" aria-hidden /> {s.label}
              {successor ? <span className="font-normal text-ink-soft">→ {successor}</span> : null}
            </span>
          );
        },
      },
      { id: "cell", accessorFn: (r) => r.probe.nominalCellConstant ?? "", header: "Cell constant", cell: ({ getValue }) => <span className="num">{getValue() === "" ? "—" : `${getValue()} /cm`}</span> },
      { id: "installed", accessorFn: (r) => r.probe.installedAt, header: "Installed", cell: ({ getValue }) => <span className="num">{formatDateTime(getValue() as number)}</span> },
      {
        id: "actions",
        header: "",
        enableSorting: false,
        cell: ({ row }) => {
          const p = row.original.probe;
          if (p.status === "retired") return <span className="num text-xs text-ink-soft">retired {formatDateTime(p.retiredAt)}</span>;
          return (
            <div className="flex justify-end gap-1">
              <Button variant="secondary" size="sm" className="h-10" onClick={() => setEditing({ kind: "move", probe: p })} aria-label={`Move ${p.serial}`}>
                <ArrowRightLeft className="size-4" aria-hidden /> Move
              </Button>
              <Button variant="secondary" size="sm" className="h-10" onClick={() => setEditing({ kind: "replace", probe: p })} aria-label={`Replace ${p.serial}`}>
                <Replace className="size-4" aria-hidden /> Replace
              </Button>
              <ConfirmDialog
                title={`Retire probe ${p.serial}?`}
                description="The tank will have no probe for this measure until you add one, so nothing will be monitored for it. Its calibration history is kept."
                confirmLabel="Retire probe"
                onConfirm={async () => Boolean(await runAction(() => retireProbeAction({ id: p.id, values: { confirm: true } }), (d) => `Probe ${d.serial} retired.`))}
                trigger={(open) => (
                  <Button variant="ghost" size="sm" className="h-10 text-bad" onClick={open} aria-label={`Retire ${p.serial}`}>
                    <Archive className="size-4" aria-hidden /> Retire
                  </Button>
                )}
              />
            </div>
          );
        },
      },
    ],
    [serialOf],
  );
  const close = () => setEditing(null);
  return (
    <>
      <div className="mb-4 space-y-3">
        <ProbeSafetyNote />
        <Button onClick={() => setEditing({ kind: "add" })} disabled={tanks.length === 0}>
          <Plus className="size-4" aria-hidden /> Add probe
        </Button>
      </div>
      <DataTable testId="probes" columns={columns} data={probes} rowId={(r) => String(r.probe.id)} searchPlaceholder="Search probes" />
      <Dialog
        open={editing !== null}
        onClose={close}
        title={editing?.kind === "add" ? "New probe" : editing?.kind === "move" ? `Move ${editing.probe.serial}` : editing?.kind === "replace" ? `Replace ${editing.probe.serial}` : ""}
      >
        {editing?.kind === "add" ? <AddProbeForm tanks={tanks} onDone={close} /> : null}
        {editing?.kind === "move" ? <MoveProbeForm probe={editing.probe} tanks={tanks} onDone={close} /> : null}
        {editing?.kind === "replace" ? <ReplaceProbeForm probe={editing.probe} onDone={close} /> : null}
      </Dialog>
    </>
  );
}
