/**
 * Runs a fleet of simulated robots against a Tessera server: one sim-robot per spec, each
 * with its own random source derived from the fleet's seed (so a fleet run is reproducible
 * robot by robot, though the interleaving with the server follows the wall clock), and each
 * with its own manufacturing spread (wheel, gyro and steering errors).
 */
import type { Floorplan } from "../lib/floorplan";
import { isFreeTile } from "../lib/floorplan";
import type { LinkLogger } from "../robots/link-client";
import { deriveSeed } from "./rng";
import { startSimRobot, type InjectResult, type SimEvent, type SimFault, type SimHandle, type SimRobotOptions, type SimRobotSpec } from "./sim-robot";

export type { InjectResult, SimEvent, SimFault, SimHandle, SimRobotSpec } from "./sim-robot";

export interface FleetOptions {
  /** The web app's origin, e.g. http://127.0.0.1:3000. */
  url: string;
  robots: SimRobotSpec[];
  plan: Floorplan;
  seed: number;
  /** Simulated seconds per wall-clock second (default 1). */
  timeScale?: number;
  /** How long startFleet waits for every robot to sign in or be refused, wall ms (default 5000); robots keep retrying afterwards. */
  readyTimeoutMs?: number;
  link?: SimRobotOptions["link"];
  idleSenseMs?: number;
  onEvent?: (event: SimEvent) => void;
  logger?: LinkLogger;
}

export interface Fleet {
  robots: Map<string, SimHandle>;
  inject(robotId: string, fault: SimFault): InjectResult;
  stop(): Promise<void>;
}

/** Starts every robot of `robots`; throws RangeError on duplicate ids or a start tile that is not free (check the fleet file first). */
export async function startFleet(opts: FleetOptions): Promise<Fleet> {
  const ids = new Set<string>();
  for (const spec of opts.robots) {
    if (ids.has(spec.id)) throw new RangeError(`startFleet: robot ${spec.id} is listed twice`);
    ids.add(spec.id);
    if (!isFreeTile(opts.plan, spec.start.row, spec.start.col)) throw new RangeError(`startFleet: ${spec.id} starts on tile (${spec.start.row}, ${spec.start.col}), which is not free`);
  }
  const robots = new Map<string, SimHandle>();
  opts.robots.forEach((spec, index) => {
    robots.set(
      spec.id,
      startSimRobot({
        url: opts.url,
        spec,
        plan: opts.plan,
        seed: deriveSeed(opts.seed, index),
        timeScale: opts.timeScale,
        link: opts.link,
        idleSenseMs: opts.idleSenseMs,
        onEvent: opts.onEvent,
        logger: opts.logger,
      }),
    );
  });

  let timer: ReturnType<typeof setTimeout> | null = null;
  const timeout = new Promise<void>((resolve) => {
    timer = setTimeout(resolve, opts.readyTimeoutMs ?? 5000);
  });
  await Promise.race([Promise.all([...robots.values()].map((robot) => robot.ready())), timeout]);
  if (timer) clearTimeout(timer);

  return {
    robots,
    inject(robotId, fault) {
      const robot = robots.get(robotId);
      if (!robot) return { ok: false, reason: `no simulated robot ${robotId}` };
      return robot.inject(fault);
    },
    async stop() {
      for (const robot of robots.values()) robot.stop();
      // Let the sockets' close frames go out before the caller exits.
      await new Promise((resolve) => setTimeout(resolve, 50));
    },
  };
}
