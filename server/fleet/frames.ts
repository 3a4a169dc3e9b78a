/** What dashboards and robots are told about a robot: its state word, its mission, its frame. */
import { HEADINGS, type RobotState } from "../../lib/vocabulary";
import type { RobotFrame } from "../../lib/protocol";
import { missionRoute } from "./route-preview";
import type { RobotRuntime } from "./robot-runtime";

/** How long a robot shows as "arrived" after reaching its goal, in ms. */
const ARRIVED_SHOWN_MS = 15_000;

export function robotState(runtime: RobotRuntime): RobotState {
  if (!runtime.online) return "offline";
  if (runtime.hold) return "held";
  if (runtime.mission) return "under_way";
  if (runtime.lastOutcome?.outcome === "reached" && Date.now() - runtime.lastOutcome.at < ARRIVED_SHOWN_MS) return "arrived";
  return "idle";
}

/** The active mission as a hello acknowledgement carries it. */
export function missionRef(runtime: RobotRuntime) {
  const m = runtime.mission;
  return m ? { id: m.id, goal: m.goal, step: m.step } : null;
}

/** The /ops robot frame, with the route the policy would take from the most likely pose. */
export function robotFrame(runtime: RobotRuntime): RobotFrame {
  const c = runtime.certainty();
  const m = runtime.mission;
  return {
    robotId: runtime.id,
    name: runtime.name,
    floorplanId: runtime.floorplanId,
    versionId: runtime.versionId,
    simulated: runtime.simulated,
    online: runtime.online,
    state: robotState(runtime),
    holdReason: runtime.hold,
    battery: runtime.battery,
    estimate: { row: c.row, col: c.col, heading: HEADINGS[c.heading], tileMass: c.tileMass, entropy: c.entropy },
    mission: m ? { id: m.id, goal: m.goal, step: m.step, claim: m.claim, route: missionRoute(runtime), givingWayTo: m.giveWay?.to ?? null, detouring: m.detour !== null } : null,
    certaintyHistory: [...runtime.certaintyHistory],
    lastMessageAt: runtime.lastMessageAt,
  };
}
