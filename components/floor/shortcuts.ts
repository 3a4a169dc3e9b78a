/**
 * Keyboard shortcuts of the live floor, page-wide and acting on the selected robot.
 * Ignored while typing in a field, with a modifier held, or while a dialog is open.
 */
"use client";

import { useEffect } from "react";
import { HEADINGS, type Heading } from "@/lib/vocabulary";
import type { FloorCommands } from "./commands";
import type { FloorStore, HeatMode } from "./store";

export interface Shortcut {
  keys: string[];
  what: string;
  operatorOnly?: boolean;
}

/** The shortcut list shown by the ? help, in the order an operator meets them. */
export const SHORTCUTS: Shortcut[] = [
  { keys: ["J", "↓"], what: "Select the next robot" },
  { keys: ["K", "↑"], what: "Select the previous robot" },
  { keys: ["H"], what: "Hold the selected robot", operatorOnly: true },
  { keys: ["R"], what: "Release the selected robot (asks first)", operatorOnly: true },
  { keys: ["L"], what: "Re-locate: pick the tile, then the heading (N E S W)", operatorOnly: true },
  { keys: ["C"], what: "Cancel the selected robot's mission", operatorOnly: true },
  { keys: ["G"], what: "Type a goal tile for the selected robot", operatorOnly: true },
  { keys: ["B"], what: "Heat layer: selected robot → all robots → off" },
  { keys: ["T"], what: "Fleet as cards or as a table" },
  { keys: ["Esc"], what: "Stop re-locating, or clear the selection" },
  { keys: ["?"], what: "Show or hide this help" },
];

const NEXT_HEAT: Record<HeatMode, HeatMode> = { selected: "all", all: "off", off: "selected" };

function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  return target.isContentEditable || ["INPUT", "TEXTAREA", "SELECT"].includes(target.tagName);
}

/** Installs the live floor's shortcuts on the document while mounted. */
export function useFloorShortcuts(store: FloorStore, commands: FloorCommands): void {
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (event.ctrlKey || event.metaKey || event.altKey || isTyping(event.target)) return;
      const s = store.getState();
      if (s.confirm || document.querySelector("dialog[open]")) return;
      const robot = s.selectedId ? s.robots[s.selectedId] : undefined;
      const key = event.key;
      const lower = key.toLowerCase();
      let handled = true;
      if (s.pick.kind === "relocate" && s.pick.tile && robot && HEADINGS.includes(key.toUpperCase() as Heading) && key.length === 1) {
        s.setConfirm({ kind: "relocate", robotId: robot.robotId, tile: s.pick.tile, heading: key.toUpperCase() as Heading });
      } else if (lower === "j" || key === "ArrowDown") s.selectStep(1);
      else if (lower === "k" || key === "ArrowUp") s.selectStep(-1);
      else if (key === "?") s.setHelpOpen(!s.helpOpen);
      else if (lower === "b") s.setHeatMode(NEXT_HEAT[s.heatMode]);
      else if (lower === "t") s.setListView(s.listView === "cards" ? "table" : "cards");
      else if (key === "Escape") {
        if (s.helpOpen) s.setHelpOpen(false);
        else if (s.pick.kind === "relocate") s.setPick({ kind: "dispatch" });
        else s.select(null);
      } else if (!commands.canCommand || !robot) handled = false;
      else if (lower === "h") {
        if (robot.state !== "held") void commands.hold(robot.robotId);
      } else if (lower === "r") {
        if (robot.state === "held") s.setConfirm({ kind: "release", robotId: robot.robotId });
        else s.notify("info", `${robot.name} is not held.`);
      } else if (lower === "l") {
        if (robot.state !== "held") s.notify("info", `Hold ${robot.name} before giving a pose hint (H).`);
        else s.setPick(s.pick.kind === "relocate" ? { kind: "dispatch" } : { kind: "relocate", tile: null, heading: null });
      } else if (lower === "c") {
        if (robot.mission) void commands.cancel(robot.robotId);
        else s.notify("info", `${robot.name} has no mission to cancel.`);
      } else if (lower === "g") document.getElementById("goal-row")?.focus();
      else handled = false;
      if (handled) event.preventDefault();
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [store, commands]);
}
