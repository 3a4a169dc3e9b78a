/**
 * The live floor's commands as the operator sees them: each one sends over /ops, shows a
 * dispatched goal at once, and turns a refusal into a notice that quotes the server.
 */
"use client";

import { createContext, useContext, useMemo } from "react";
import type { SimFaultMessage } from "@/lib/protocol";
import type { Heading } from "@/lib/vocabulary";
import type { TileCoord } from "./geometry";
import type { SendCommand } from "./rest-commands";
import type { FloorStore } from "./store";

export interface FloorCommands {
  canCommand: boolean;
  dispatch(robotId: string, goal: TileCoord): Promise<boolean>;
  cancel(robotId: string): Promise<boolean>;
  hold(robotId: string): Promise<boolean>;
  release(robotId: string): Promise<boolean>;
  relocate(robotId: string, tile: TileCoord, heading: Heading | null): Promise<boolean>;
  ackAlert(alertId: number): Promise<boolean>;
  /** Admins only: fault injection into simulated robots. */
  canInject: boolean;
  injectFault(robotId: string, fault: SimFaultMessage): Promise<boolean>;
}

/** Command functions bound to one store and socket; viewers get functions that refuse locally. */
export function useFloorCommandSet(store: FloorStore, send: SendCommand, canCommand: boolean, canInject = false): FloorCommands {
  return useMemo(() => {
    const nameOf = (robotId: string) => store.getState().robots[robotId]?.name ?? robotId;
    const run = async (what: string, go: () => ReturnType<SendCommand>, done: string): Promise<boolean> => {
      if (!canCommand) {
        store.getState().notify("error", "Your role may watch the floor but not command robots.");
        return false;
      }
      const ack = await go();
      if (ack.ok) store.getState().notify("info", done);
      else store.getState().notify("error", `${what}: ${ack.error.message}`);
      return ack.ok;
    };
    return {
      canCommand,
      async dispatch(robotId, goal) {
        store.getState().setPendingGoal(robotId, goal);
        const ok = await run(`${nameOf(robotId)} was not dispatched`, () => send("dispatch", { robotId, goal }), `${nameOf(robotId)} sent to tile (${goal.row}, ${goal.col})`);
        if (!ok) store.getState().setPendingGoal(robotId, null);
        return ok;
      },
      cancel: (robotId) => run(`${nameOf(robotId)}'s mission was not cancelled`, () => send("cancel", { robotId }), `${nameOf(robotId)}'s mission cancelled`),
      hold: (robotId) => run(`${nameOf(robotId)} was not held`, () => send("hold", { robotId }), `${nameOf(robotId)} held`),
      release: (robotId) => run(`${nameOf(robotId)} was not released`, () => send("release", { robotId }), `${nameOf(robotId)} released`),
      relocate: (robotId, tile, heading) =>
        run(
          `${nameOf(robotId)}'s pose hint was not accepted`,
          () => send("relocate", heading ? { robotId, row: tile.row, col: tile.col, heading } : { robotId, row: tile.row, col: tile.col }),
          `Pose hint for ${nameOf(robotId)}: tile (${tile.row}, ${tile.col})${heading ? `, facing ${heading}` : ""}`,
        ),
      ackAlert: (alertId) => run("The alert was not acknowledged", () => send("ackAlert", { alertId }), "Alert acknowledged"),
      canInject,
      injectFault: (robotId, fault) => run(`The ${fault.kind} fault was not injected into ${nameOf(robotId)}`, () => send("fault", { robotId, fault }), `Fault injected into ${nameOf(robotId)}: ${fault.kind}`),
    };
  }, [store, send, canCommand, canInject]);
}

export const FloorCommandsContext = createContext<FloorCommands | null>(null);

/** The page's command set; throws outside <LiveFloor>, which is a programmer error. */
export function useFloorCommands(): FloorCommands {
  const commands = useContext(FloorCommandsContext);
  if (!commands) throw new Error("useFloorCommands must be used inside <LiveFloor>");
  return commands;
}
