/**
 * Filter benchmark: one motion + sense update (forward, then three range
 * readings) on a 64 × 64 floorplan, timed over many iterations, against
 * (i) the floor of one streaming multiply-add pass over a Float64Array of the
 * same length as the belief and (ii) a straightforward nested-array
 * (number[][][]) implementation of the same update. Also reports the memory of
 * the range and transition tables for a 256 × 256 plan.
 */
import { createFilter } from "../../lib/belief/filter";
import type { Floorplan } from "../../lib/floorplan/types";
import { emptyFloorplan } from "../../lib/floorplan/plan";
import { defaultMotion } from "../../lib/motion/model";
import type { MotionModel } from "../../lib/motion/model";
import { buildTransitions } from "../../lib/motion/transitions";
import { motionUpdate } from "../../lib/motion/update";
import { senseUpdate } from "../../lib/sensing/update";
import { beamLikelihood } from "../../lib/sensing/beam";
import type { SensorModel, SensorReading, SensorSpec } from "../../lib/sensing/model";
import { defaultSensorModel } from "../../lib/sensing/model";
import { beamAngleRad, buildRangeTable, castRay, rangeTableBytes } from "../../lib/sensing/ray-cast";
import { HEADING_STEP } from "../../lib/vocabulary";

const SENSORS: SensorSpec[] = [
  { id: "front", kind: "range", bearingDeg: 0, maxRangeM: 3 },
  { id: "left", kind: "range", bearingDeg: 60, maxRangeM: 3 },
  { id: "right", kind: "range", bearingDeg: -60, maxRangeM: 3 },
];

/** A plan with a border wall and scattered pillars from a fixed linear congruential sequence. */
function benchPlan(side: number): Floorplan {
  const plan = emptyFloorplan(side, side);
  let seed = 12345;
  const rand = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648;
  };
  for (let r = 0; r < side; r++) {
    for (let c = 0; c < side; c++) {
      const edge = r === 0 || c === 0 || r === side - 1 || c === side - 1;
      if (edge || rand() < 0.12) plan.blocked[r * side + c] = 1;
    }
  }
  plan.blocked[(side >> 1) * side + (side >> 1)] = 0;
  return plan;
}

/** The floor: one multiply-add over every element of a Float64Array passed in, as library code receives a belief. */
function streamingPass(values: Float64Array): void {
  for (let i = 0; i < values.length; i++) values[i] = values[i] * 0.999 + 1e-9;
}

function time(label: string, iterations: number, run: () => void): number {
  for (let i = 0; i < Math.min(50, iterations); i++) run();
  const start = performance.now();
  for (let i = 0; i < iterations; i++) run();
  const ms = (performance.now() - start) / iterations;
  console.log(`  ${label.padEnd(42)} ${ms.toFixed(4)} ms`);
  return ms;
}

/** The same update written the plain way: nested arrays, outcomes worked out per state, beam model evaluated per state. */
function nestedUpdate(plan: Floorplan, belief: number[][][], expected: number[][][][], model: MotionModel, sensorModel: SensorModel, readings: number[]): number[][][] {
  const { rows, cols } = plan;
  const free = (r: number, c: number) => r >= 0 && r < rows && c >= 0 && c < cols && plan.blocked[r * cols + c] === 0;
  let freeStates = 0;
  for (let r = 0; r < rows; r++) for (let c = 0; c < cols; c++) if (free(r, c)) freeStates += 4;
  const next: number[][][] = [];
  for (let r = 0; r < rows; r++) {
    next.push([]);
    for (let c = 0; c < cols; c++) next[r].push(free(r, c) ? [1, 1, 1, 1].map(() => model.mix / freeStates) : [0, 0, 0, 0]);
  }
  const { ok, stall, over } = model.forward;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      if (!free(r, c)) continue;
      for (let h = 0; h < 4; h++) {
        const p = belief[r][c][h] * (1 - model.mix);
        if (p === 0) continue;
        const [dr, dc] = HEADING_STEP[h];
        next[r][c][h] += p * stall;
        if (!free(r + dr, c + dc)) {
          next[r][c][h] += p * (ok + over);
        } else {
          next[r + dr][c + dc][h] += p * ok;
          if (free(r + 2 * dr, c + 2 * dc)) next[r + 2 * dr][c + 2 * dc][h] += p * over;
          else next[r + dr][c + dc][h] += p * over;
        }
      }
    }
  }
  let sum = 0;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      if (!free(r, c)) continue;
      for (let h = 0; h < 4; h++) {
        let l = 1;
        for (let k = 0; k < readings.length; k++) {
          const sensor = SENSORS[k] as Extract<SensorSpec, { kind: "range" }>;
          l *= beamLikelihood(readings[k], expected[r][c][h][k], sensor.maxRangeM, sensorModel.range);
        }
        next[r][c][h] *= l;
        sum += next[r][c][h];
      }
    }
  }
  for (let r = 0; r < rows; r++) for (let c = 0; c < cols; c++) for (let h = 0; h < 4; h++) next[r][c][h] /= sum;
  return next;
}

/** Runs the benchmark and prints ms per update, the ratios and the table memory. */
export async function runFilterBench(): Promise<void> {
  const plan = benchPlan(64);
  const model = defaultMotion("differential");
  const sensorModel = defaultSensorModel();
  const filter = createFilter(plan, model, SENSORS, sensorModel);
  const centre = { row: 32, col: 32, heading: 1 };
  const readings: SensorReading[] = SENSORS.map((s) => ({
    sensor: s.id,
    rangeM: castRay(plan, centre.row, centre.col, beamAngleRad(centre.heading, (s as { bearingDeg: number }).bearingDeg), (s as { maxRangeM: number }).maxRangeM) + 0.013,
  }));
  const states = filter.belief.length;
  console.log(`filter bench: 64 × 64 plan (${states} states), forward + 3 range readings`);

  const start = filter.belief.slice();
  const actions = ["forward", "left", "forward", "right"] as const;
  let tick = 0;
  const update = time("createFilter step (motion + sense)", 5000, () => {
    filter.step(actions[tick++ & 3], readings);
  });
  time("  motion alone", 5000, () => filter.motion("forward"));
  time("  sense alone", 5000, () => filter.sense(readings));
  filter.reset();
  const pureOut = new Float64Array(states);
  const pureSense = new Float64Array(states);
  time("pure motionUpdate + senseUpdate (tables)", 2000, () => {
    motionUpdate(plan, start, "forward", model, { out: pureOut, table: filter.table });
    senseUpdate(plan, pureOut, readings, SENSORS, sensorModel, { out: pureSense, ranges: filter.ranges });
  });

  const stream = new Float64Array(states).fill(1 / states);
  const floor = time("streaming multiply-add pass (floor)", 20000, () => streamingPass(stream));
  const inlineFloor = time("  same pass on a closure constant", 20000, () => {
    for (let i = 0; i < states; i++) stream[i] = stream[i] * 0.999 + 1e-9;
  });

  const expected: number[][][][] = [];
  for (let r = 0; r < 64; r++) {
    expected.push([]);
    for (let c = 0; c < 64; c++) expected[r].push([0, 1, 2, 3].map((h) => filter.ranges.expectedM.map((e) => e[(r * 64 + c) * 4 + h])));
  }
  const nestedStart: number[][][] = [];
  for (let r = 0; r < 64; r++) {
    nestedStart.push([]);
    for (let c = 0; c < 64; c++) nestedStart[r].push([0, 1, 2, 3].map((h) => start[(r * 64 + c) * 4 + h]));
  }
  const values = readings.map((r) => ("rangeM" in r ? r.rangeM : 0));
  let nestedOut = nestedStart;
  const nested = time("nested number[][][] update", 60, () => {
    nestedOut = nestedUpdate(plan, nestedStart, expected, model, sensorModel, values);
  });

  filter.reset(start);
  filter.step("forward", readings);
  let maxDiff = 0;
  for (let r = 0; r < 64; r++) for (let c = 0; c < 64; c++) for (let h = 0; h < 4; h++) maxDiff = Math.max(maxDiff, Math.abs(nestedOut[r][c][h] - filter.belief[(r * 64 + c) * 4 + h]));

  console.log(`  ratio to streaming floor               ${(update / floor).toFixed(1)}×  (target ≤ 3×; ${(update / inlineFloor).toFixed(1)}× against the closure-constant pass)`);
  console.log(`  speed-up over nested arrays            ${(nested / update).toFixed(1)}×  (target ≥ 10×)`);
  console.log(`  max |fast − nested| per state          ${maxDiff.toExponential(2)}`);

  const big = benchPlan(256);
  const ranges = buildRangeTable(big, SENSORS);
  const transitions = buildTransitions(big, model);
  const transitionBytes = transitions.offsets.byteLength + transitions.next.byteLength + transitions.prob.byteLength + transitions.bumped.byteLength;
  console.log(`  256 × 256: range tables ${(rangeTableBytes(ranges) / 1e6).toFixed(2)} MB for 3 sensors, transition table ${(transitionBytes / 1e6).toFixed(2)} MB`);
}
