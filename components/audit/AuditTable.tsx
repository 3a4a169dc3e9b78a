"use client";

import { createColumnHelper } from "@tanstack/react-table";
import type { AuditItem } from "@/lib/crew/schemas";
import { DataTable } from "../admin/DataTable";
import { formatUtc } from "../admin/when";

const column = createColumnHelper<AuditItem>();

function detailText(detail: unknown): string {
  if (!detail || typeof detail !== "object" || Object.keys(detail).length === 0) return "";
  return Object.entries(detail as Record<string, unknown>)
    .map(([k, v]) => `${k}: ${typeof v === "object" ? JSON.stringify(v) : String(v)}`)
    .join(" · ");
}

const columns = [
  column.accessor("at", { header: "When (UTC)", cell: (c) => <span className="font-mono text-xs tabular-nums">{formatUtc(c.getValue())}</span> }),
  column.accessor((r) => r.userName ?? (r.userId === null ? "system" : `user ${r.userId}`), { id: "who", header: "Who" }),
  column.accessor("action", { header: "Action", cell: (c) => <span className="rounded bg-ink-800 px-1.5 py-0.5 font-mono text-xs">{c.getValue()}</span> }),
  column.accessor("target", { header: "Target", cell: (c) => <span className="font-mono text-xs">{c.getValue()}</span> }),
  column.accessor((r) => detailText(r.detail), { id: "detail", header: "Detail", enableSorting: false, cell: (c) => <span className="text-xs text-ink-300">{c.getValue()}</span> }),
];

/** One page of the audit trail; sorting applies within the page, filters and paging are the server's. */
export function AuditTable({ items }: { items: AuditItem[] }) {
  return <DataTable rows={items} columns={columns} label="Audit trail" empty="No action matches these filters." rowId={(r) => String(r.id)} />;
}
