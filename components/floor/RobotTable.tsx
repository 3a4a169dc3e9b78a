"use client";

import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type FilterFn,
  type SortingState,
} from "@tanstack/react-table";
import clsx from "clsx";
import { useState } from "react";
import { useShallow } from "zustand/react/shallow";
import type { RobotFrame } from "@/lib/protocol/ops-feed";
import { ROBOT_STATES } from "@/lib/vocabulary";
import { Age, Battery, Certainty, StatePill } from "./bits";
import { STATE_LABELS } from "./format";
import { useFloor } from "./store";

const column = createColumnHelper<RobotFrame>();

const stateIs: FilterFn<RobotFrame> = (row, _id, value: string) => value === "" || row.original.state === value;

const columns = [
  column.accessor("name", { header: "Robot", cell: (c) => <span className="font-semibold">{c.getValue()}</span> }),
  column.accessor("state", {
    header: "State",
    filterFn: stateIs,
    sortingFn: (a, b) => ROBOT_STATES.indexOf(a.original.state) - ROBOT_STATES.indexOf(b.original.state),
    cell: (c) => <StatePill robot={c.row.original} />,
  }),
  column.accessor((r) => r.estimate?.tileMass ?? -1, { id: "certainty", header: "Certainty", cell: (c) => <Certainty value={c.row.original.estimate?.tileMass ?? null} /> }),
  column.accessor((r) => r.battery ?? -1, { id: "battery", header: "Battery", cell: (c) => <Battery value={c.row.original.battery} /> }),
  column.accessor((r) => (r.mission ? r.mission.route.length : -1), {
    id: "mission",
    header: "Mission",
    cell: (c) => {
      const m = c.row.original.mission;
      return <span className="font-mono text-xs tabular-nums">{m ? `(${m.goal.row}, ${m.goal.col}) s${m.step}` : "—"}</span>;
    },
  }),
  column.accessor((r) => r.lastMessageAt ?? 0, { id: "age", header: "Last msg", sortDescFirst: false, cell: (c) => <Age at={c.row.original.lastMessageAt} /> }),
];

/** All robots in a sortable, filterable table (TanStack Table); a row click selects the robot. */
export function RobotTable() {
  const robots = useFloor(useShallow((s) => s.robotIds.map((id) => s.robots[id]).filter((r): r is RobotFrame => r !== undefined)));
  const selectedId = useFloor((s) => s.selectedId);
  const select = useFloor((s) => s.select);
  const [sorting, setSorting] = useState<SortingState>([]);
  const [globalFilter, setGlobalFilter] = useState("");
  const [columnFilters, setColumnFilters] = useState<ColumnFiltersState>([]);
  const stateFilter = (columnFilters.find((f) => f.id === "state")?.value as string | undefined) ?? "";
  const table = useReactTable({
    data: robots,
    columns,
    state: { sorting, globalFilter, columnFilters },
    onSortingChange: setSorting,
    onGlobalFilterChange: setGlobalFilter,
    onColumnFiltersChange: setColumnFilters,
    globalFilterFn: (row, _id, value: string) => {
      const q = value.trim().toLowerCase();
      return q === "" || row.original.name.toLowerCase().includes(q) || row.original.robotId.toLowerCase().includes(q);
    },
    getRowId: (r) => r.robotId,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  return (
    <div className="space-y-2">
      <div className="flex gap-2">
        <input
          type="search"
          value={globalFilter}
          onChange={(e) => setGlobalFilter(e.target.value)}
          placeholder="Filter by name"
          aria-label="Filter robots by name"
          className="min-w-0 flex-1 rounded border border-ink-700 bg-ink-950 px-2 py-1 text-sm"
        />
        <select
          aria-label="Filter robots by state"
          value={stateFilter}
          onChange={(e) => setColumnFilters(e.target.value ? [{ id: "state", value: e.target.value }] : [])}
          className="rounded border border-ink-700 bg-ink-950 px-1.5 py-1 text-sm"
        >
          <option value="">Any state</option>
          {ROBOT_STATES.map((s) => (
            <option key={s} value={s}>
              {STATE_LABELS[s]}
            </option>
          ))}
        </select>
      </div>
      <table className="w-full border-collapse text-sm" data-testid="robot-table">
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id} className="border-b border-ink-700 text-left text-xs text-ink-500">
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th key={header.id} scope="col" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"} className="px-1.5 py-1 font-medium">
                    <button type="button" onClick={header.column.getToggleSortingHandler()} className="hover:text-ink-100">
                      {flexRender(header.column.columnDef.header, header.getContext())}
                      <span aria-hidden className="ml-0.5 inline-block w-2">
                        {sorted === "asc" ? "▴" : sorted === "desc" ? "▾" : ""}
                      </span>
                    </button>
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr
              key={row.id}
              onClick={() => select(row.id)}
              aria-selected={row.id === selectedId}
              className={clsx("cursor-pointer border-b border-ink-800", row.id === selectedId ? "bg-tide/10" : "hover:bg-ink-800/60")}
            >
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="px-1.5 py-1.5 align-middle">
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
          {table.getRowModel().rows.length === 0 && (
            <tr>
              <td colSpan={columns.length} className="px-1.5 py-3 text-center text-xs text-ink-500">
                No robot matches the filter.
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}
