import type { Metadata } from "next";
import Link from "next/link";
import { countOf } from "@/components/admin/plural";
import { MailMessage } from "@/components/mail/MailMessage";
import { listCaughtMail, MailListQuery, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Sent mail" };

export default async function MailPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requirePageRole("admin", "/mail");
  const params = await searchParams;
  const parsed = MailListQuery.safeParse({ page: typeof params.page === "string" ? params.page : undefined });
  const query = parsed.success ? parsed.data : MailListQuery.parse({});
  const { items, total } = await listCaughtMail(query);
  const pages = Math.max(1, Math.ceil(total / query.limit));
  return (
    <section className="mx-auto max-w-4xl space-y-4 p-6">
      <div>
        <h1 className="text-xl font-semibold">Sent mail</h1>
        <p className="mt-1 text-sm text-ink-500">
          Tessera&apos;s own mail catcher keeps every message the server sends while no SMTP provider is configured, so invites and resets can be followed from here. {countOf(total, "message")} · page{" "}
          {query.page} of {pages}
        </p>
      </div>
      {items.length === 0 && <p className="rounded-lg border border-dashed border-ink-700 p-4 text-sm text-ink-300">No mail yet. Invite someone from Crew to send the first.</p>}
      {items.map((mail) => (
        <MailMessage key={mail.id} mail={mail} />
      ))}
      <nav aria-label="Mail pages" className="flex gap-3 text-sm">
        {query.page > 1 && (
          <Link href={`/mail?page=${query.page - 1}`} className="text-tide underline-offset-4 hover:underline">
            ← Newer
          </Link>
        )}
        {query.page < pages && (
          <Link href={`/mail?page=${query.page + 1}`} className="text-tide underline-offset-4 hover:underline">
            Older →
          </Link>
        )}
      </nav>
    </section>
  );
}
