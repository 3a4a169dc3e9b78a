"use client";

import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { useState } from "react";
import { holdCount, type ShiftRobotRow } from "@/lib/protocol/reports";
import { formatCertainty, formatDurationS } from "@/lib/reports/format";

const column = createColumnHelper<ShiftRobotRow>();

const columns = [
  column.accessor("robotName", { header: "Robot", cell: (c) => c.getValue() }),
  column.accessor("started", { header: "Started" }),
  column.accessor("reached", { header: "Reached" }),
  column.accessor("aborted", { header: "Aborted" }),
  column.accessor("failed", { header: "Failed" }),
  column.accessor("active", { header: "Under way" }),
  column.accessor("underWayS", { header: "Time under way", cell: (c) => formatDurationS(c.getValue()) }),
  column.accessor("medianReachS", { header: "Median to reach", cell: (c) => formatDurationS(c.getValue()), sortUndefined: "last" }),
  column.accessor("certaintyMin", { header: "Lowest certainty", cell: (c) => formatCertainty(c.getValue()) }),
  column.accessor("certaintyMean", { header: "Mean lowest certainty", cell: (c) => formatCertainty(c.getValue()) }),
  column.accessor((r) => holdCount(r.holds), { id: "holds", header: "Holds" }),
];

/** The per-robot figures, sortable by any column. */
export function RobotFigures({ rows }: { rows: ShiftRobotRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const table = useReactTable({ data: rows, columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });
  if (rows.length === 0) return <p className="rounded border border-dashed border-ink-700 p-4 text-sm text-ink-300">No robot started a mission in this range.</p>;
  return (
    <table className="w-full text-sm" aria-label="Per robot">
      <thead className="text-left text-ink-500">
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id}>
            {group.headers.map((header) => {
              const sorted = header.column.getIsSorted();
              return (
                <th key={header.id} className="py-1 pr-3 font-normal" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}>
                  <button type="button" onClick={header.column.getToggleSortingHandler()} className="hover:text-ink-100">
                    {flexRender(header.column.columnDef.header, header.getContext())}
                    {sorted === "asc" ? " ↑" : sorted === "desc" ? " ↓" : ""}
                  </button>
                </th>
              );
            })}
          </tr>
        ))}
      </thead>
      <tbody>
        {table.getRowModel().rows.map((row) => (
          <tr key={row.id} className="border-t border-ink-800">
            {row.getVisibleCells().map((cell) => (
              <td key={cell.id} className={cell.column.id === "robotName" ? "py-1 pr-3" : "py-1 pr-3 font-mono"}>
                {flexRender(cell.column.columnDef.cell, cell.getContext())}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
