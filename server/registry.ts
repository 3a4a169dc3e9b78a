/**
 * Process-wide handles shared with route handlers through globalThis, because Next
 * bundles route handlers apart from the custom server and module singletons differ.
 */
import type { Server } from "socket.io";
import type { OpsCommandName, RobotFrame } from "../lib/protocol";
import type { SessionUser } from "./auth/options";
import type { Fleet } from "./fleet/fleet";

interface Registry {
  io?: Server;
  fleet?: Fleet;
  /** Set when several nodes share the fleet (server/cluster): robot commands run on the robot's owner. */
  routeCommand?: (name: Exclude<OpsCommandName, "watch" | "ackAlert">, payload: { robotId: string }, user: SessionUser) => Promise<unknown>;
  /** Set with routeCommand: the frames of every robot of a floorplan, whichever node serves it. */
  floorFrames?: (floorplanId: number) => Promise<RobotFrame[]>;
}

const holder = globalThis as unknown as { __tesseraRegistry?: Registry };

export function registry(): Registry {
  return (holder.__tesseraRegistry ??= {});
}

/** The running fleet service; route handlers fail clearly when the custom server is not running. */
export function runningFleet(): Fleet {
  const fleet = registry().fleet;
  if (!fleet) throw new Error("the fleet service is not running in this process (start Tessera through server/index.ts)");
  return fleet;
}
