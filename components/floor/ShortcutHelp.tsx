"use client";

import { useEffect, useRef } from "react";
import { useFloorCommands } from "./commands";
import { Kbd } from "./bits";
import { SHORTCUTS } from "./shortcuts";
import { useFloor, useFloorStore } from "./store";

/** The ? help: every shortcut this role can use. */
export function ShortcutHelp() {
  const store = useFloorStore();
  const open = useFloor((s) => s.helpOpen);
  const { canCommand } = useFloorCommands();
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-labelledby="floor-help-title"
      onClose={() => store.getState().setHelpOpen(false)}
      onClick={(e) => {
        if (e.target === e.currentTarget) store.getState().setHelpOpen(false);
      }}
      className="m-auto w-[min(30rem,calc(100vw-2rem))] rounded-lg border border-ink-700 bg-ink-900 p-5 text-ink-100 backdrop:bg-ink-950/70"
    >
      <h2 id="floor-help-title" className="mb-3 text-lg font-semibold">
        Live floor shortcuts
      </h2>
      <dl className="grid grid-cols-[6rem_1fr] gap-x-3 gap-y-1.5 text-sm">
        {SHORTCUTS.filter((s) => canCommand || !s.operatorOnly).map((s) => (
          <div key={s.what} className="contents">
            <dt className="flex gap-1">
              {s.keys.map((k) => (
                <Kbd key={k}>{k}</Kbd>
              ))}
            </dt>
            <dd className="text-ink-300">{s.what}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-3 text-xs text-ink-500">{canCommand ? "Click a free tile on the map to send the selected robot there." : "Your role watches the floor; commands are for operators."}</p>
      <form method="dialog" className="mt-4 text-right">
        <button className="rounded-md border border-ink-700 px-3 py-1.5 text-sm">Close</button>
      </form>
    </dialog>
  );
}
