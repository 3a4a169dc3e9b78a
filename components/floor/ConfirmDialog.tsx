"use client";

import { useEffect, useRef, useState } from "react";
import { useFloorCommands } from "./commands";
import { formatPercent, stateLabel } from "./format";
import { SafetyCaution } from "./SafetyCaution";
import { useFloor, useFloorStore, type PendingConfirm } from "./store";

function titleOf(c: PendingConfirm, name: string): string {
  if (c.kind === "dispatch") return `Send ${name} to tile (${c.goal.row}, ${c.goal.col})?`;
  if (c.kind === "release") return `Release ${name}?`;
  return `Pose hint for ${name}: tile (${c.tile.row}, ${c.tile.col})${c.heading ? `, facing ${c.heading}` : ", heading unknown"}?`;
}

const ACTION_WORDS: Record<PendingConfirm["kind"], string> = { dispatch: "Send robot", release: "Release robot", relocate: "Apply pose hint" };

/** The confirmation for dispatch, release and re-locate, with the safety caution where a robot may move. */
export function ConfirmDialog() {
  const store = useFloorStore();
  const confirm = useFloor((s) => s.confirm);
  const robot = useFloor((s) => (s.confirm ? s.robots[s.confirm.robotId] : undefined));
  const commands = useFloorCommands();
  const ref = useRef<HTMLDialogElement>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (confirm && !dialog.open) dialog.showModal();
    if (!confirm && dialog.open) dialog.close();
  }, [confirm]);

  const close = () => store.getState().setConfirm(null);

  const go = async () => {
    if (!confirm || busy) return;
    setBusy(true);
    const c = confirm;
    close();
    if (c.kind === "dispatch") await commands.dispatch(c.robotId, c.goal);
    else if (c.kind === "release") await commands.release(c.robotId);
    else {
      const ok = await commands.relocate(c.robotId, c.tile, c.heading);
      if (ok) store.getState().setPick({ kind: "dispatch" });
    }
    setBusy(false);
  };

  const name = robot?.name ?? confirm?.robotId ?? "";
  const lowCertainty = robot?.estimate && robot.estimate.tileMass < 0.35;
  return (
    <dialog
      ref={ref}
      aria-labelledby="floor-confirm-title"
      data-testid="confirm-dialog"
      onClose={close}
      className="m-auto w-[min(34rem,calc(100vw-2rem))] rounded-lg border border-ink-700 bg-ink-900 p-0 text-ink-100 shadow-2xl backdrop:bg-ink-950/70"
    >
      {confirm && (
        <form
          method="dialog"
          className="space-y-3 p-5"
          onSubmit={(e) => {
            e.preventDefault();
            void go();
          }}
        >
          <h2 id="floor-confirm-title" className="text-lg font-semibold">
            {titleOf(confirm, name)}
          </h2>
          {robot && (
            <p className="text-sm text-ink-300">
              Now {stateLabel(robot.state, robot.holdReason).toLowerCase()}
              {robot.estimate ? `, most likely at (${robot.estimate.row}, ${robot.estimate.col}) facing ${robot.estimate.heading}, ${formatPercent(robot.estimate.tileMass)} certain` : ", no position estimate yet"}
              {robot.mission && confirm.kind === "dispatch" ? `. This replaces its mission to (${robot.mission.goal.row}, ${robot.mission.goal.col})` : ""}.
            </p>
          )}
          {lowCertainty && confirm.kind !== "relocate" && (
            <p className="text-sm text-amberline">Certainty is low: the robot may not be where the map shows it. Consider a pose hint first.</p>
          )}
          {confirm.kind === "relocate" ? (
            <p className="text-sm text-ink-300">The robot's belief is centred on this tile as a hint; it keeps sensing and corrects the hint if it is wrong.</p>
          ) : (
            <SafetyCaution />
          )}
          <div className="flex justify-end gap-2 pt-1">
            <button type="button" onClick={close} className="rounded-md border border-ink-700 px-3 py-1.5 text-sm text-ink-300 hover:border-ink-500 hover:text-ink-100">
              Cancel
            </button>
            <button type="submit" autoFocus disabled={busy} className="rounded-md bg-tide px-3 py-1.5 text-sm font-semibold text-ink-950 hover:bg-tide/85 disabled:opacity-50">
              {ACTION_WORDS[confirm.kind]}
            </button>
          </div>
        </form>
      )}
    </dialog>
  );
}
