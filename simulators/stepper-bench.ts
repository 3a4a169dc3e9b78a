/**
 * Simulator benchmark: ten thousand 10 ms plant steps of a moving robot, then ten thousand
 * steps' worth of tile actions (plant + controllers), and a full sensor read (three rangers
 * and a floor sensor) on the demo floor; best of several warm runs. Run with
 * `npx tsx simulators/stepper-bench.ts`, or call runStepperBench() from the bench entry.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { parseFloorplan } from "../lib/floorplan";
import { defaultControlParams, runAction } from "./action-controller";
import { createSimState, defaultPlantParams, stepRobot, type SimState } from "./robot-physics";
import { createRng } from "./rng";
import { defaultSensorParams, readSensors } from "./sim-sensors";

const SENSORS = [
  { id: "us-front", kind: "range" as const, bearingDeg: 0, maxRangeM: 3 },
  { id: "us-left", kind: "range" as const, bearingDeg: 90, maxRangeM: 3 },
  { id: "us-right", kind: "range" as const, bearingDeg: -90, maxRangeM: 3 },
  { id: "floor", kind: "floor" as const },
];

function bestOf(runs: number, body: () => void): number {
  let best = Number.POSITIVE_INFINITY;
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    body();
    best = Math.min(best, performance.now() - start);
  }
  return best;
}

/** Prints the timings and returns them in milliseconds. */
export function runStepperBench(): { plantSteps10kMs: number; actionSteps10kMs: number; sensorReadUs: number } {
  const plan = parseFloorplan(readFileSync(fileURLToPath(new URL("../db/seed-data/demo-lab.txt", import.meta.url)), "utf8"));
  const start = createSimState(plan, defaultPlantParams("differential", plan.tileM), { row: 10, col: 5, heading: 1 });
  const plantSteps10kMs = bestOf(8, () => {
    const rng = createRng(1);
    let s: SimState = start;
    for (let i = 0; i < 10_000; i++) s = stepRobot(s, { kind: "differential", leftMS: 0.05, rightMS: 0.052 }, 0.01, rng);
  });
  const actionSteps10kMs = bestOf(8, () => {
    const rng = createRng(2);
    let s: SimState = start;
    let simulatedS = 0;
    const control = defaultControlParams();
    for (let k = 0; simulatedS < 100; k++) {
      const result = runAction(s, k % 2 === 0 ? "left" : "right", control, rng);
      s = result.state;
      simulatedS += result.report.durationS;
    }
  });
  const reads = 10_000;
  const sensorMs = bestOf(5, () => {
    const rng = createRng(3);
    for (let i = 0; i < reads; i++) readSensors(start, SENSORS, defaultSensorParams(), rng);
  });
  const result = { plantSteps10kMs, actionSteps10kMs, sensorReadUs: (sensorMs * 1000) / reads };
  console.log(
    `simulator: 10k plant steps ${plantSteps10kMs.toFixed(2)} ms; 10k steps of turns (plant + controller) ${actionSteps10kMs.toFixed(2)} ms; ` +
      `one full sensor read ${result.sensorReadUs.toFixed(2)} µs`,
  );
  return result;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) runStepperBench();
