"use client";

import { createColumnHelper } from "@tanstack/react-table";
import clsx from "clsx";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import type { CrewMember, MemberState, UserPatch } from "@/lib/crew/schemas";
import { ROLES, type Role } from "@/lib/vocabulary";
import { DataTable } from "../admin/DataTable";
import { Outcome } from "../admin/Field";
import { sendJson } from "../admin/send-json";

const column = createColumnHelper<CrewMember>();

const STATE_LABEL: Record<MemberState, string> = { active: "Active", invited: "Invited", deactivated: "Deactivated" };
const STATE_CLASS: Record<MemberState, string> = { active: "text-tide", invited: "text-amberline", deactivated: "text-ink-500" };

const SMALL_BUTTON = "rounded border border-ink-700 px-2 py-0.5 text-xs text-ink-300 hover:border-ink-500 hover:text-ink-100 disabled:opacity-50";

/** The crew with a role, on-call and deactivation control per user; each change is sent at once. */
export function CrewTable({ members, me }: { members: CrewMember[]; me: number }) {
  const router = useRouter();
  const [busy, setBusy] = useState<number | null>(null);
  const [outcome, setOutcome] = useState<{ ok: boolean; text: string } | null>(null);

  const columns = useMemo(() => {
    const change = async (m: CrewMember, patch: UserPatch, done: string) => {
      setBusy(m.id);
      setOutcome(null);
      const result = await sendJson("PATCH", `/api/users/${m.id}`, patch);
      setBusy(null);
      setOutcome(result.ok ? { ok: true, text: done } : { ok: false, text: result.message ?? "Not changed." });
      router.refresh();
    };
    const sendLink = async (m: CrewMember) => {
      setBusy(m.id);
      setOutcome(null);
      const result = await sendJson<{ kind: string }>("POST", `/api/users/${m.id}/reset`);
      setBusy(null);
      setOutcome(
        result.ok
          ? { ok: true, text: result.data?.kind === "invite" ? `Invite sent to ${m.email} again.` : `Password reset link sent to ${m.email}.` }
          : { ok: false, text: result.message ?? "No link was sent." },
      );
      router.refresh();
    };
    return [
      column.accessor("name", {
        header: "Name",
        cell: (c) => (
          <span className="font-medium">
            {c.getValue()}
            {c.row.original.id === me && <span className="ml-1.5 text-xs text-ink-500">(you)</span>}
          </span>
        ),
      }),
      column.accessor("email", { header: "E-mail", cell: (c) => <span className="font-mono text-xs">{c.getValue()}</span> }),
      column.accessor("role", {
        header: "Role",
        sortingFn: (a, b) => ROLES.indexOf(a.original.role) - ROLES.indexOf(b.original.role),
        cell: (c) => {
          const m = c.row.original;
          return (
            <select
              aria-label={`Role of ${m.name}`}
              value={m.role}
              disabled={busy === m.id}
              onChange={(e) => void change(m, { role: e.target.value as Role }, `${m.name} is now ${e.target.value}.`)}
              className="rounded border border-ink-700 bg-ink-800 px-1.5 py-0.5 text-sm"
            >
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {r}
                </option>
              ))}
            </select>
          );
        },
      }),
      column.accessor("state", { header: "State", cell: (c) => <span className={clsx("text-xs font-medium", STATE_CLASS[c.getValue()])}>{STATE_LABEL[c.getValue()]}</span> }),
      column.accessor("onCall", {
        header: "On call",
        cell: (c) => {
          const m = c.row.original;
          return (
            <input
              type="checkbox"
              aria-label={`On call: ${m.name}`}
              checked={m.onCall}
              disabled={busy === m.id}
              onChange={(e) => void change(m, { onCall: e.target.checked }, e.target.checked ? `${m.name} now gets alert e-mails.` : `${m.name} no longer gets alert e-mails.`)}
              className="size-4 accent-tide"
            />
          );
        },
      }),
      column.display({
        id: "actions",
        header: "Actions",
        cell: (c) => {
          const m = c.row.original;
          const off = m.state === "deactivated";
          return (
            <div className="flex gap-1.5">
              {!off && (
                <button type="button" disabled={busy === m.id} onClick={() => void sendLink(m)} className={SMALL_BUTTON} aria-label={`${m.state === "invited" ? "Resend invite to" : "Send password reset to"} ${m.name}`}>
                  {m.state === "invited" ? "Resend invite" : "Send reset"}
                </button>
              )}
              <button
                type="button"
                disabled={busy === m.id}
                onClick={() => void change(m, { disabled: !off }, off ? `${m.name} can sign in again.` : `${m.name} is deactivated and signed out.`)}
                className={clsx(SMALL_BUTTON, !off && "hover:border-coral/60 hover:text-coral")}
                aria-label={`${off ? "Reactivate" : "Deactivate"} ${m.name}`}
              >
                {off ? "Reactivate" : "Deactivate"}
              </button>
            </div>
          );
        },
      }),
    ];
  }, [busy, me, router]);

  return (
    <div className="space-y-2">
      <Outcome outcome={outcome} />
      <DataTable rows={members} columns={columns} label="Crew" empty="Nobody is on the crew yet." rowId={(m) => String(m.id)} />
    </div>
  );
}
