/**
 * The live floor across nodes: what a dashboard's `watch` needs (every robot of a floorplan
 * with its belief) from this node's robots, the other nodes' answers and, for robots nobody
 * serves, their last known frame shown offline. Live updates need no such help: the Redis
 * adapter carries every node's broadcasts to every node's dashboards.
 */
import type { Namespace } from "socket.io";
import { quantiseMarginal, type BeliefFrame, type RobotFrame } from "../../lib/protocol";
import type { Fleet } from "../fleet/fleet";
import { logger } from "../logger";
import type { Ownership } from "./ownership";

/** A belief frame as JSON carries it between nodes (the adapter's requests are JSON). */
interface WireBelief {
  robotId: string;
  rows: number;
  cols: number;
  scale: number;
  data: number[];
}

interface NodeFrames {
  robots: RobotFrame[];
  beliefs: WireBelief[];
}

export interface FloorView {
  robots: RobotFrame[];
  beliefs: BeliefFrame[];
}

export class FleetView {
  constructor(
    private readonly nsp: Namespace,
    private readonly fleet: Fleet,
    private readonly ownership: Ownership,
  ) {
    nsp.on("tessera:frames", (floorplanId: unknown, reply: (frames: NodeFrames) => void) => {
      reply(typeof floorplanId === "number" ? this.local(floorplanId) : { robots: [], beliefs: [] });
    });
  }

  /** This node's own robots on the floorplan, with their beliefs. */
  private local(floorplanId: number): NodeFrames {
    const robots = this.fleet.frames(floorplanId).filter((f) => this.ownership.owns(f.robotId));
    const beliefs = robots.flatMap((f) => {
      const m = this.fleet.marginal(f.robotId);
      if (!m) return [];
      const q = quantiseMarginal(m.marginal);
      return [{ robotId: f.robotId, rows: m.rows, cols: m.cols, scale: q.scale, data: [...q.data] }];
    });
    return { robots, beliefs };
  }

  async floor(floorplanId: number): Promise<FloorView> {
    const answers = await new Promise<NodeFrames[]>((resolve) => {
      this.nsp.serverSideEmit("tessera:frames", floorplanId, (err: Error | null, responses: NodeFrames[]) => {
        if (err) logger.warn({ err: err.message }, "not every node sent its frames");
        resolve(responses ?? []);
      });
    });
    const robots = new Map<string, RobotFrame>();
    const beliefs: BeliefFrame[] = [];
    for (const [i, answer] of [this.local(floorplanId), ...answers].entries()) {
      for (const frame of answer.robots) {
        robots.set(frame.robotId, frame);
        // Kept for when that node dies: its robots stay on the floor, offline, until taken over.
        if (i > 0) this.ownership.parked.set(frame.robotId, frame);
      }
      for (const b of answer.beliefs) beliefs.push({ ...b, data: Uint8Array.from(b.data) });
    }
    for (const [id, frame] of this.ownership.parked) {
      if (robots.has(id) || frame.floorplanId !== floorplanId) continue;
      robots.set(id, { ...frame, online: false, state: "offline", mission: frame.mission ? { ...frame.mission, claim: null, route: [] } : null });
    }
    return { robots: [...robots.values()], beliefs };
  }
}
