"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import type { RosterEntry } from "@/lib/roster";
import { Age, StatePill } from "@/components/floor/bits";
import { rosterCall } from "./api";
import { KeyPanel } from "./KeyPanel";
import { RegisterRobotForm, type Registered } from "./RegisterRobotForm";

type Pending = { kind: "rotate" | "retire"; robot: RosterEntry };

const DRIVE_LABEL: Record<RosterEntry["drive"], string> = { differential: "Differential", bicycle: "Bicycle" };

/** Confirms a key rotation or a retirement, which both cut a connected robot off at once. */
function ConfirmAction({ pending, onConfirm, onCancel, error }: { pending: Pending | null; onConfirm: () => void; onCancel: () => void; error: string | null }) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (pending && !dialog.open) dialog.showModal();
    if (!pending && dialog.open) dialog.close();
  }, [pending]);
  const name = pending?.robot.name ?? "";
  return (
    <dialog
      ref={ref}
      aria-labelledby="roster-confirm-title"
      onClose={onCancel}
      className="m-auto w-[min(30rem,calc(100vw-2rem))] rounded-lg border border-ink-700 bg-ink-900 p-0 text-ink-100 shadow-2xl backdrop:bg-ink-950/70"
    >
      {pending && (
        <form
          method="dialog"
          className="space-y-3 p-5"
          onSubmit={(e) => {
            e.preventDefault();
            onConfirm();
          }}
        >
          <h2 id="roster-confirm-title" className="text-lg font-semibold">
            {pending.kind === "rotate" ? `Rotate ${name}'s key?` : `Retire ${name}?`}
          </h2>
          <p className="text-sm text-ink-300">
            {pending.kind === "rotate"
              ? "The current key stops working now. If the robot is connected it is disconnected and cannot reconnect until it is given the new key, which is shown once."
              : "The robot is taken off the live floor; an active mission is aborted. It can no longer connect. Its missions stay in the logbook."}
          </p>
          {error && (
            <p role="alert" className="text-sm text-coral">
              {error}
            </p>
          )}
          <div className="flex justify-end gap-2">
            <button type="button" onClick={onCancel} className="rounded-md border border-ink-700 px-3 py-1 text-sm text-ink-300 hover:text-ink-100">
              Keep as is
            </button>
            <button type="submit" className="rounded-md border border-coral/60 bg-coral/10 px-3 py-1 text-sm text-coral hover:bg-coral/20">
              {pending.kind === "rotate" ? "Rotate key" : "Retire robot"}
            </button>
          </div>
        </form>
      )}
    </dialog>
  );
}

/** The roster: every robot with its drive, floorplan, kind, link state and last message; admins register, rotate keys and retire. */
export function RosterScreen({ robots, floorplans, isAdmin }: { robots: RosterEntry[]; floorplans: { id: number; name: string }[]; isAdmin: boolean }) {
  const router = useRouter();
  const [registering, setRegistering] = useState(false);
  const [shownKey, setShownKey] = useState<{ robotId: string; robotName: string; key: string } | null>(null);
  const [pending, setPending] = useState<Pending | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);

  const registered = (r: Registered) => {
    setRegistering(false);
    setShownKey({ robotId: r.robot.id, robotName: r.robot.name, key: r.key });
    router.refresh();
  };

  const confirm = async () => {
    if (!pending) return;
    const { kind, robot } = pending;
    const path = `/api/robots/${encodeURIComponent(robot.id)}/${kind === "rotate" ? "key" : "retire"}`;
    const result = await rosterCall<{ key?: string }>("POST", path);
    if (!result.ok) {
      setActionError(result.error.message);
      return;
    }
    setPending(null);
    setActionError(null);
    if (kind === "rotate" && result.data.key) setShownKey({ robotId: robot.id, robotName: robot.name, key: result.data.key });
    router.refresh();
  };

  return (
    <section className="mx-auto max-w-6xl space-y-4 p-6">
      <div className="flex items-center justify-between">
        <h1 className="text-xl font-semibold">Roster</h1>
        {isAdmin && !registering && (
          <button type="button" onClick={() => setRegistering(true)} className="rounded-md border border-tide/60 px-3 py-1 text-sm text-tide hover:bg-tide/10">
            Register
          </button>
        )}
      </div>
      {shownKey && <KeyPanel robotId={shownKey.robotId} robotName={shownKey.robotName} secret={shownKey.key} onDone={() => setShownKey(null)} />}
      {registering && <RegisterRobotForm floorplans={floorplans} onRegistered={registered} onCancel={() => setRegistering(false)} />}
      <table className="w-full border-collapse text-sm" aria-label="Robots on the roster">
        <thead>
          <tr className="border-b border-ink-700 text-left text-xs text-ink-500">
            <th scope="col" className="px-1.5 py-1 font-medium">
              Robot
            </th>
            <th scope="col" className="px-1.5 py-1 font-medium">
              Drive
            </th>
            <th scope="col" className="px-1.5 py-1 font-medium">
              Floorplan
            </th>
            <th scope="col" className="px-1.5 py-1 font-medium">
              Kind
            </th>
            <th scope="col" className="px-1.5 py-1 font-medium">
              State
            </th>
            <th scope="col" className="px-1.5 py-1 font-medium">
              Last seen
            </th>
            {isAdmin && (
              <th scope="col" className="px-1.5 py-1 font-medium">
                <span className="sr-only">Actions</span>
              </th>
            )}
          </tr>
        </thead>
        <tbody>
          {robots.map((r) => (
            <tr key={r.id} className="border-b border-ink-800 hover:bg-ink-800/40">
              <td className="px-1.5 py-1.5">
                <Link href={`/roster/${encodeURIComponent(r.id)}`} className="font-semibold text-tide underline-offset-2 hover:underline">
                  {r.name}
                </Link>
                <span className="ml-2 font-mono text-xs text-ink-500">{r.id}</span>
              </td>
              <td className="px-1.5 py-1.5">{DRIVE_LABEL[r.drive]}</td>
              <td className="px-1.5 py-1.5">{r.floorplanName ?? "Default"}</td>
              <td className="px-1.5 py-1.5">{r.simulated ? "Simulated" : "Hardware"}</td>
              <td className="px-1.5 py-1.5">
                <StatePill robot={{ state: r.state, holdReason: null }} />
              </td>
              <td className="px-1.5 py-1.5">{r.lastSeenAt === null ? <span className="text-ink-500">never this run</span> : <Age at={r.lastSeenAt} />}</td>
              {isAdmin && (
                <td className="space-x-1 px-1.5 py-1.5 text-right">
                  <button
                    type="button"
                    aria-label={`Rotate key of ${r.name}`}
                    onClick={() => {
                      setActionError(null);
                      setPending({ kind: "rotate", robot: r });
                    }}
                    className="rounded border border-ink-700 px-2 py-0.5 text-xs text-ink-300 hover:text-ink-100"
                  >
                    Rotate key
                  </button>
                  <button
                    type="button"
                    aria-label={`Retire ${r.name}`}
                    onClick={() => {
                      setActionError(null);
                      setPending({ kind: "retire", robot: r });
                    }}
                    className="rounded border border-ink-700 px-2 py-0.5 text-xs text-ink-300 hover:border-coral/60 hover:text-coral"
                  >
                    Retire
                  </button>
                </td>
              )}
            </tr>
          ))}
          {robots.length === 0 && (
            <tr>
              <td colSpan={isAdmin ? 7 : 6} className="px-1.5 py-4 text-center text-sm text-ink-500">
                No robots yet.{isAdmin ? " Register one to get its key." : ""}
              </td>
            </tr>
          )}
        </tbody>
      </table>
      <ConfirmAction pending={pending} error={actionError} onConfirm={() => void confirm()} onCancel={() => setPending(null)} />
    </section>
  );
}
