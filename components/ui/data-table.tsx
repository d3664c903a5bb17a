"use client";
import { useMemo, useState } from "react";
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type ColumnFiltersState,
  type RowData,
  type SortingState,
} from "@tanstack/react-table";
import { ArrowDown, ArrowUp, ArrowUpDown, ChevronLeft, ChevronRight, Search } from "lucide-react";
import { Button } from "./button";
import { cn } from "./cn";
import { Input } from "./input";
import { Select } from "./select";

declare module "@tanstack/react-table" {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Offer a filter above the table: a pick-list of the column's values, or free text. */
    filter?: "select" | "text";
    /** Label of the filter and of sorting, when the header is not plain text. */
    label?: string;
    className?: string;
  }
}

/**
 * The one table of the settings screens: click a header to sort, filter by the search box and the
 * column filters, page through long lists. Works on a phone by scrolling sideways.
 */
export function DataTable<T>({
  columns,
  data,
  searchPlaceholder = "Search",
  initialSorting = [],
  pageSize = 25,
  rowId,
  empty = "Nothing here yet.",
  testId,
}: {
  columns: ColumnDef<T, unknown>[];
  data: T[];
  searchPlaceholder?: string;
  initialSorting?: SortingState;
  pageSize?: number;
  rowId?: (row: T) => string;
  empty?: React.ReactNode;
  testId?: string;
}) {
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const [globalFilter, setGlobalFilter] = useState("");
  const [columnFilters, setColumnFilters] = useState<ColumnFiltersState>([]);
  // A pick-list filter matches the whole value ("Active" must not match "Deactivated").
  const withFilters = useMemo(() => columns.map((c) => (c.meta?.filter === "select" && !c.filterFn ? { ...c, filterFn: "equalsString" as const } : c)), [columns]);
  // No React Compiler in this app; TanStack Table manages its own memoisation.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data,
    columns: withFilters,
    state: { sorting, globalFilter, columnFilters },
    onSortingChange: setSorting,
    onGlobalFilterChange: setGlobalFilter,
    onColumnFiltersChange: setColumnFilters,
    getRowId: rowId ? (row) => rowId(row) : undefined,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize } },
  });
  const filterable = table.getAllLeafColumns().filter((c) => c.columnDef.meta?.filter);
  const { pageIndex } = table.getState().pagination;
  const rows = table.getRowModel().rows;
  const matching = table.getFilteredRowModel().rows.length;

  return (
    <div data-table={testId} className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <div className="relative min-w-[12rem] flex-1">
          <Search className="pointer-events-none absolute left-3 top-1/2 size-4 -translate-y-1/2 text-ink-faint" aria-hidden />
          <Input aria-label={searchPlaceholder} placeholder={searchPlaceholder} value={globalFilter} onChange={(e) => setGlobalFilter(e.target.value)} className="pl-9" />
        </div>
        {filterable.map((column) => {
          const label = column.columnDef.meta?.label ?? String(column.columnDef.header);
          const value = (column.getFilterValue() as string | undefined) ?? "";
          if (column.columnDef.meta?.filter === "text") {
            return (
              <Input key={column.id} aria-label={`Filter by ${label}`} placeholder={label} value={value} onChange={(e) => column.setFilterValue(e.target.value || undefined)} className="w-44" />
            );
          }
          const values = [...new Set(data.map((row) => String(column.accessorFn?.(row, 0) ?? "")))].filter(Boolean).sort();
          return (
            <div key={column.id} className="w-48">
              <Select
                aria-label={`Filter by ${label}`}
                value={value}
                placeholder={`Every ${label.toLowerCase()}`}
                options={values.map((v) => ({ value: v, label: v }))}
                onChange={(e) => column.setFilterValue(e.target.value || undefined)}
              />
            </div>
          );
        })}
      </div>

      <div className="overflow-x-auto rounded-lg border border-paper-line bg-paper-raised">
        <table className="w-full min-w-[640px] text-sm">
          <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const Icon = sorted === "asc" ? ArrowUp : sorted === "desc" ? ArrowDown : ArrowUpDown;
                  return (
                    <th
                      key={header.id}
                      className={cn("px-4 py-2 font-semibold", header.column.columnDef.meta?.className)}
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                    >
                      {header.isPlaceholder ? null : header.column.getCanSort() ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="-mx-1 inline-flex min-h-9 items-center gap-1 rounded px-1 uppercase hover:text-ink">
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <Icon className={cn("size-3.5", sorted ? "text-ink" : "text-ink-faint")} aria-hidden />
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} data-row={row.id} className="border-b border-paper-line last:border-0 hover:bg-paper">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={cn("px-4 py-2.5 align-middle", cell.column.columnDef.meta?.className)}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-4 py-8 text-center text-ink-soft">
                  {data.length === 0 ? empty : "Nothing matches these filters."}
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>

      {table.getPageCount() > 1 ? (
        <div className="flex items-center justify-between gap-3 text-sm text-ink-soft">
          <span className="num">
            {pageIndex * table.getState().pagination.pageSize + 1}–{Math.min((pageIndex + 1) * table.getState().pagination.pageSize, matching)} of {matching}
          </span>
          <div className="flex gap-2">
            <Button type="button" variant="secondary" size="md" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()} aria-label="Previous page">
              <ChevronLeft className="size-4" aria-hidden /> Previous
            </Button>
            <Button type="button" variant="secondary" size="md" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()} aria-label="Next page">
              Next <ChevronRight className="size-4" aria-hidden />
            </Button>
          </div>
        </div>
      ) : (
        <p className="num text-sm text-ink-soft">{matching === data.length ? `${data.length} in all` : `${matching} of ${data.length}`}</p>
      )}
    </div>
  );
}
