/** Operator commands shared by the /ops socket and the HTTP routes: one function each. */
import { eq } from "drizzle-orm";
import { alerts } from "../../db/schema";
import type { OpsCommand, OpsCommandName } from "../../lib/protocol";
import type { SessionUser } from "../auth/options";
import { TesseraError } from "../errors";
import type { Actor, Fleet } from "../fleet/fleet";
import { registry } from "../registry";

export function actorOf(user: SessionUser): Actor {
  return { userId: Number(user.id), label: user.email };
}

/** Runs a command: on this node, or on the node that owns the robot when several nodes share the fleet. */
export async function runCommand(fleet: Fleet, name: Exclude<OpsCommandName, "watch">, payload: unknown, user: SessionUser): Promise<unknown> {
  const routed = registry().routeCommand;
  if (routed && name !== "ackAlert") return routed(name, payload as { robotId: string }, user);
  return runOnThisNode(fleet, name, payload, user);
}

/** Runs a command against this node's fleet service. */
export async function runOnThisNode(fleet: Fleet, name: Exclude<OpsCommandName, "watch">, payload: unknown, user: SessionUser): Promise<unknown> {
  const actor = actorOf(user);
  switch (name) {
    case "dispatch": {
      const p = payload as OpsCommand<"dispatch">;
      return { mission: await fleet.dispatch(p.robotId, p.goal, actor) };
    }
    case "cancel":
      await fleet.cancel((payload as OpsCommand<"cancel">).robotId, actor);
      return {};
    case "hold":
      await fleet.holdRobot((payload as OpsCommand<"hold">).robotId, actor);
      return {};
    case "release":
      await fleet.release((payload as OpsCommand<"release">).robotId, actor);
      return {};
    case "relocate": {
      const p = payload as OpsCommand<"relocate">;
      await fleet.relocate(p.robotId, { row: p.row, col: p.col, heading: p.heading }, actor);
      return {};
    }
    case "fault": {
      const p = payload as OpsCommand<"fault">;
      await fleet.injectFault(p.robotId, p.fault, actor);
      return {};
    }
    case "ackAlert": {
      const { alertId } = payload as OpsCommand<"ackAlert">;
      const result = await fleet.db.update(alerts).set({ ackBy: actor.userId, ackAt: new Date() }).where(eq(alerts.id, alertId));
      if (result[0].affectedRows === 0) throw new TesseraError("not_found", "ackAlert", `There is no alert ${alertId}.`);
      return { alertId, ackBy: user.name, ackAt: Date.now() };
    }
  }
}
