"use client";
// The incident history: sortable (TanStack Table via the shared DataTable), searchable, paged.
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import type { IncidentState } from "@/db/schema";
import { DataTable } from "@/components/ui/data-table";
import { formatDateTime } from "@/lib/display/time";
import { formatDuration } from "@/lib/alerts";
import { IncidentStateBadge } from "./state";

export interface HistoryRow {
  id: number;
  state: IncidentState;
  openedAt: number;
  site: string;
  tank: string;
  cause: string;
  message: string;
  calibrationLapsed: boolean;
  toAcknowledgeMs: number | null;
  toResolveMs: number | null;
  acknowledgedBy: string | null;
}

const byNumber = (a: number | null, b: number | null) => (a ?? Infinity) - (b ?? Infinity);

const columns: ColumnDef<HistoryRow, unknown>[] = [
  { accessorKey: "state", header: "State", cell: ({ row }) => <IncidentStateBadge state={row.original.state} /> },
  {
    accessorKey: "openedAt",
    header: "Opened",
    cell: ({ row }) => (
      <Link className="num font-medium hover:underline" href={`/incidents/${row.original.id}`}>
        {formatDateTime(row.original.openedAt)}
      </Link>
    ),
  },
  {
    accessorKey: "tank",
    header: "Tank",
    cell: ({ row }) => (
      <>
        {row.original.tank}
        <div className="text-xs text-ink-soft">{row.original.site}</div>
      </>
    ),
  },
  { accessorKey: "cause", header: "Cause" },
  {
    accessorKey: "message",
    header: "What happened",
    enableSorting: false,
    cell: ({ row }) => (
      <>
        {row.original.message}
        {row.original.calibrationLapsed ? <div className="text-xs font-medium text-warn">calibration lapsed</div> : null}
      </>
    ),
  },
  {
    accessorKey: "toAcknowledgeMs",
    header: "To acknowledge",
    sortingFn: (a, b) => byNumber(a.original.toAcknowledgeMs, b.original.toAcknowledgeMs),
    cell: ({ row }) => (
      <span className="num">
        {row.original.toAcknowledgeMs === null ? "—" : formatDuration(row.original.toAcknowledgeMs)}
        {row.original.acknowledgedBy ? <div className="text-xs text-ink-soft">{row.original.acknowledgedBy}</div> : null}
      </span>
    ),
  },
  {
    accessorKey: "toResolveMs",
    header: "To resolve",
    sortingFn: (a, b) => byNumber(a.original.toResolveMs, b.original.toResolveMs),
    cell: ({ row }) => <span className="num">{row.original.toResolveMs === null ? "—" : formatDuration(row.original.toResolveMs)}</span>,
  },
];

export function HistoryTable({ rows }: { rows: HistoryRow[] }) {
  return (
    <DataTable
      columns={columns}
      data={rows}
      searchPlaceholder="Search tank, cause or message"
      initialSorting={[{ id: "openedAt", desc: true }]}
      pageSize={25}
      rowId={(r) => String(r.id)}
      empty="No incidents match these filters."
      testId="incident-history"
    />
  );
}
