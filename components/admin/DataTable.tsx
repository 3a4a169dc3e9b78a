"use client";

import { flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState, type TableOptions } from "@tanstack/react-table";
import { useState } from "react";

/** A dense, sortable table for the admin pages (TanStack Table); paging, where any, is the server's. */
export function DataTable<T>({ rows, columns, label, empty, rowId }: { rows: T[]; columns: TableOptions<T>["columns"]; label: string; empty: string; rowId: (row: T) => string }) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getRowId: rowId,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  return (
    <table aria-label={label} className="w-full border-collapse text-sm">
      <thead>
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id} className="border-b border-ink-700 text-left text-xs text-ink-500">
            {group.headers.map((header) => {
              const sorted = header.column.getIsSorted();
              const title = flexRender(header.column.columnDef.header, header.getContext());
              return (
                <th key={header.id} scope="col" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined} className="px-2 py-1.5 font-medium">
                  {header.column.getCanSort() ? (
                    <button type="button" onClick={header.column.getToggleSortingHandler()} className="hover:text-ink-100">
                      {title}
                      <span aria-hidden className="ml-0.5 inline-block w-2">
                        {sorted === "asc" ? "▴" : sorted === "desc" ? "▾" : ""}
                      </span>
                    </button>
                  ) : (
                    title
                  )}
                </th>
              );
            })}
          </tr>
        ))}
      </thead>
      <tbody>
        {table.getRowModel().rows.map((row) => (
          <tr key={row.id} className="border-b border-ink-800 hover:bg-ink-800/40">
            {row.getVisibleCells().map((cell) => (
              <td key={cell.id} className="px-2 py-1.5 align-middle">
                {flexRender(cell.column.columnDef.cell, cell.getContext())}
              </td>
            ))}
          </tr>
        ))}
        {table.getRowModel().rows.length === 0 && (
          <tr>
            <td colSpan={columns.length} className="px-2 py-4 text-center text-xs text-ink-500">
              {empty}
            </td>
          </tr>
        )}
      </tbody>
    </table>
  );
}
