import type { Metadata } from "next";
import { countOf } from "@/components/admin/plural";
import { CrewTable } from "@/components/crew/CrewTable";
import { InviteForm } from "@/components/crew/InviteForm";
import { listCrew, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Crew" };

export default async function CrewPage() {
  const me = await requirePageRole("admin", "/crew");
  const members = await listCrew();
  const onCall = members.filter((m) => m.onCall && m.state !== "deactivated").length;
  return (
    <section className="mx-auto max-w-6xl space-y-4 p-6">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-xl font-semibold">Crew</h1>
        <p className="text-sm text-ink-500">
          {countOf(members.length, "user")} · {onCall} on call for alert e-mails · the last active admin cannot be demoted or deactivated
        </p>
      </div>
      <InviteForm />
      <CrewTable members={members} me={Number(me.id)} />
    </section>
  );
}
