/** Worker thread: solves one policy off the main event loop. */
import { parentPort, workerData } from "node:worker_threads";
import type { Floorplan, Tile } from "../../lib/floorplan";
import type { MotionModel } from "../../lib/motion";
import { planPolicy } from "../../lib/planning";

const { plan, goal, model } = workerData as { plan: Floorplan; goal: Tile; model: MotionModel };
const policy = planPolicy(plan, goal, model);
parentPort?.postMessage({ value: policy.value, action: policy.action, sweeps: policy.sweeps, converged: policy.converged }, [policy.value.buffer as ArrayBuffer, policy.action.buffer as ArrayBuffer]);
