/**
 * The demo keeps itself alive: now and then each idle simulated robot is sent to a random
 * reachable free tile, so the floor moves and the logbook fills without anyone clicking.
 * Only simulated robots are ever sent; hardware is never moved by the demo.
 */
import { isFreeTile } from "../../lib/floorplan";
import { TesseraError } from "../errors";
import { logger } from "../logger";
import type { Fleet } from "./fleet";

export function startDemoErrands(fleet: Fleet, opts: { everyMs?: number; chance?: number; random?: () => number } = {}): () => void {
  const random = opts.random ?? Math.random;
  const chance = opts.chance ?? 0.5;
  const timer = setInterval(() => {
    for (const runtime of fleet.robots.values()) {
      if (!runtime.simulated || !runtime.online || runtime.mission || runtime.hold) continue;
      if (runtime.lastOutcome && Date.now() - runtime.lastOutcome.at < 4000) continue;
      if (random() > chance) continue;
      const plan = runtime.plan;
      for (let tries = 0; tries < 20; tries++) {
        const row = Math.floor(random() * plan.rows);
        const col = Math.floor(random() * plan.cols);
        if (!isFreeTile(plan, row, col) || plan.nogo[row * plan.cols + col]) continue;
        const c = runtime.certainty();
        if (Math.abs(c.row - row) + Math.abs(c.col - col) < 5) continue;
        fleet.dispatch(runtime.id, { row, col }, { userId: null, label: "demo scheduler" }).catch((err: unknown) => {
          if (!(err instanceof TesseraError)) logger.warn({ err, robot: runtime.id }, "demo errand failed");
        });
        break;
      }
    }
  }, opts.everyMs ?? 5000);
  timer.unref();
  return () => clearInterval(timer);
}
