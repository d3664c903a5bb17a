"use client";
import { useMemo, useState } from "react";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { Pencil, Plus } from "lucide-react";
import type { SiteRow } from "@/db/queries/settings-sites";
import type { TankSettingsRow } from "@/db/queries/settings-tanks";
import { Button } from "@/components/ui/button";
import { DataTable } from "@/components/ui/data-table";
import { Dialog } from "@/components/ui/dialog";
import { ecUnitLabel, formatEc, type EcUnit } from "@/lib/display/units";
import { TankForm } from "./tank-form";

export function TanksEditor({ tanks, sites, ecUnit }: { tanks: TankSettingsRow[]; sites: SiteRow[]; ecUnit: EcUnit }) {
  const [editing, setEditing] = useState<TankSettingsRow["tank"] | "new" | null>(null);
  const columns = useMemo<ColumnDef<TankSettingsRow, unknown>[]>(
    () => [
      {
        id: "name",
        accessorFn: (r) => r.tank.name,
        header: "Tank",
        cell: ({ row }) => (
          <Link href={`/tanks/${row.original.tank.id}`} className="font-medium hover:underline">
            {row.original.tank.name}
          </Link>
        ),
      },
      { id: "site", accessorFn: (r) => r.siteName, header: "Site", meta: { filter: "select", label: "Site" } },
      { id: "zone", accessorFn: (r) => r.zoneName ?? "—", header: "Zone" },
      { id: "crop", accessorFn: (r) => r.tank.crop, header: "Crop", meta: { filter: "select", label: "Crop" } },
      { id: "ph", accessorFn: (r) => r.tank.phMin, header: "pH band", cell: ({ row }) => <span className="num">{row.original.tank.phMin.toFixed(2)}–{row.original.tank.phMax.toFixed(2)}</span> },
      {
        id: "ec",
        accessorFn: (r) => r.tank.ecMinUs,
        header: `EC band (${ecUnitLabel(ecUnit)})`,
        cell: ({ row }) => (
          <span className="num">
            {formatEc(row.original.tank.ecMinUs, ecUnit)}–{formatEc(row.original.tank.ecMaxUs, ecUnit)}
          </span>
        ),
      },
      { id: "interval", accessorFn: (r) => r.tank.calibrationIntervalDays, header: "Calibrate every", cell: ({ getValue }) => <span className="num">{String(getValue())} days</span> },
      { id: "controller", accessorFn: (r) => r.tank.controllerId ?? "—", header: "Controller", cell: ({ getValue }) => <code className="font-mono text-xs">{String(getValue())}</code> },
      {
        id: "edit",
        header: "",
        enableSorting: false,
        cell: ({ row }) => (
          <Button variant="secondary" size="sm" className="h-10" onClick={() => setEditing(row.original.tank)} aria-label={`Edit ${row.original.tank.name}`}>
            <Pencil className="size-4" aria-hidden /> Edit
          </Button>
        ),
      },
    ],
    [ecUnit],
  );
  return (
    <>
      <div className="mb-4">
        <Button onClick={() => setEditing("new")} disabled={sites.length === 0}>
          <Plus className="size-4" aria-hidden /> Add tank
        </Button>
        {sites.length === 0 ? <p className="mt-2 text-sm text-ink-soft">Add a site first (Sites & zones).</p> : null}
      </div>
      <DataTable testId="tanks" columns={columns} data={tanks} rowId={(r) => String(r.tank.id)} searchPlaceholder="Search tanks" initialSorting={[{ id: "name", desc: false }]} />
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === "new" ? "New tank" : editing ? `Edit ${editing.name}` : ""} className="w-[min(46rem,calc(100vw-2rem))]">
        {editing ? <TankForm key={editing === "new" ? "new" : editing.id} tank={editing === "new" ? undefined : editing} sites={sites} ecUnit={ecUnit} onDone={() => setEditing(null)} /> : null}
      </Dialog>
    </>
  );
}
