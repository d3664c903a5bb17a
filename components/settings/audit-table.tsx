"use client";
import { useMemo } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import type { AuditRow } from "@/db/queries/audit";
import { DataTable } from "@/components/ui/data-table";
import { formatDateTime } from "@/lib/display/time";
import { describeAuditDetail } from "@/lib/settings/audit-text";

export function AuditTable({ entries }: { entries: AuditRow[] }) {
  const columns = useMemo<ColumnDef<AuditRow, unknown>[]>(
    () => [
      { id: "at", accessorFn: (e) => e.at, header: "When", cell: ({ getValue }) => <span className="num whitespace-nowrap">{formatDateTime(getValue() as number)}</span> },
      { id: "who", accessorFn: (e) => e.userName ?? "Tidewell", header: "Who", meta: { filter: "select", label: "Person" } },
      { id: "entity", accessorFn: (e) => e.entity, header: "Record", meta: { filter: "select", label: "Record" } },
      { id: "action", accessorFn: (e) => e.action, header: "Change", meta: { filter: "select", label: "Change" }, cell: ({ getValue }) => <code className="font-mono text-xs">{String(getValue())}</code> },
      { id: "detail", accessorFn: (e) => describeAuditDetail(e.detail), header: "Detail", enableSorting: false, cell: ({ getValue }) => <span className="text-ink-soft">{String(getValue())}</span> },
    ],
    [],
  );
  return <DataTable testId="audit" columns={columns} data={entries} rowId={(e) => String(e.id)} searchPlaceholder="Search the audit log" initialSorting={[{ id: "at", desc: true }]} pageSize={50} />;
}
