import type { Metadata } from "next";
import Link from "next/link";
import { countOf } from "@/components/admin/plural";
import { AuditTable } from "@/components/audit/AuditTable";
import { AuditQuery, auditActions, listAudit, listCrew, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Audit" };

const CONTROL = "rounded border border-ink-700 bg-ink-800 px-2 py-1";

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requirePageRole("admin", "/audit");
  const raw = Object.fromEntries(Object.entries(await searchParams).flatMap(([k, v]) => (typeof v === "string" && v !== "" ? [[k, v]] : [])));
  const parsed = AuditQuery.safeParse(raw);
  const query = parsed.success ? parsed.data : AuditQuery.parse({});
  const [{ items, total }, crew, actions] = await Promise.all([listAudit(query), listCrew(), auditActions()]);
  const pages = Math.max(1, Math.ceil(total / query.limit));
  const pageLink = (page: number) => `/audit?${new URLSearchParams({ ...raw, page: String(page) })}`;
  return (
    <section className="mx-auto max-w-6xl space-y-4 p-6">
      <h1 className="text-xl font-semibold">Audit</h1>
      {!parsed.success && <p className="text-sm text-coral">Some filters were not valid and were ignored.</p>}
      <form className="flex flex-wrap items-end gap-3 text-sm" aria-label="Filter the audit trail">
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">Who</span>
          <select name="user" defaultValue={raw.user ?? ""} className={CONTROL}>
            <option value="">Anyone</option>
            {crew.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">Action</span>
          <select name="action" defaultValue={raw.action ?? ""} className={CONTROL}>
            <option value="">Any action</option>
            {actions.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">From</span>
          <input type="date" name="from" defaultValue={raw.from ?? ""} className={CONTROL} />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-500">To</span>
          <input type="date" name="to" defaultValue={raw.to ?? ""} className={CONTROL} />
        </label>
        <button type="submit" className="rounded-md border border-tide/60 px-3 py-1 text-tide">
          Show
        </button>
      </form>
      <p className="text-sm text-ink-500" data-testid="audit-total">
        {countOf(total, "action")} · page {query.page} of {pages}
      </p>
      <AuditTable items={items} />
      <nav aria-label="Audit pages" className="flex gap-3 text-sm">
        {query.page > 1 && (
          <Link href={pageLink(query.page - 1)} className="text-tide underline-offset-4 hover:underline">
            ← Newer
          </Link>
        )}
        {query.page < pages && (
          <Link href={pageLink(query.page + 1)} className="text-tide underline-offset-4 hover:underline">
            Older →
          </Link>
        )}
      </nav>
    </section>
  );
}
