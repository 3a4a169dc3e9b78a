import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { emptyFloorplan } from "../floorplan/plan";
import { parseFloorplan } from "../floorplan/parse";
import type { Floorplan } from "../floorplan/types";
import { stateIndex } from "../floorplan/types";
import type { MotionModel } from "../motion/model";
import { defaultMotion } from "../motion/model";
import { motionUpdate } from "../motion/update";
import type { SensorReading, SensorSpec } from "../sensing/model";
import { defaultSensorModel } from "../sensing/model";
import { beamAngleRad, castRay } from "../sensing/ray-cast";
import { senseUpdateDetailed } from "../sensing/update";
import { ACTIONS, HEADING_STEP } from "../vocabulary";
import { certainty, poseBelief, uniformBelief } from "./belief";
import { createFilter } from "./filter";

const SENSORS: SensorSpec[] = [
  { id: "front", kind: "range", bearingDeg: 0, maxRangeM: 1.5 },
  { id: "left", kind: "range", bearingDeg: 70, maxRangeM: 1.2 },
  { id: "right", kind: "range", bearingDeg: -90, maxRangeM: 1.5 },
  { id: "rear", kind: "range", bearingDeg: 180, maxRangeM: 1 },
  { id: "floor", kind: "floor" },
];

function expectValidBelief(plan: Floorplan, belief: Float64Array): void {
  let sum = 0;
  for (let s = 0; s < belief.length; s++) {
    const v = belief[s];
    if (!(Number.isFinite(v) && v >= 0)) throw new Error(`state ${s} holds ${v}`);
    if (plan.blocked[s >> 2] !== 0 && v !== 0) throw new Error(`blocked state ${s} holds ${v}`);
    sum += v;
  }
  expect(sum).toBeCloseTo(1, 10);
}

const planArb = fc
  .record({ rows: fc.integer({ min: 1, max: 6 }), cols: fc.integer({ min: 1, max: 6 }), seed: fc.array(fc.boolean(), { minLength: 36, maxLength: 36 }), tileM: fc.double({ min: 0.1, max: 1, noNaN: true }) })
  .map(({ rows, cols, seed, tileM }) => {
    const plan = emptyFloorplan(rows, cols, tileM);
    for (let i = 0; i < rows * cols; i++) plan.blocked[i] = seed[i] ? 1 : 0;
    plan.blocked[0] = 0;
    for (let i = 0; i < rows * cols; i++) if (!plan.blocked[i] && seed[(i * 7) % 36]) plan.mark[i] = 1 + (i % 3);
    return plan;
  });

const readingArb: fc.Arbitrary<SensorReading> = fc.oneof(
  fc.record({ sensor: fc.constantFrom("front", "left", "right", "rear", "ghost"), rangeM: fc.oneof(fc.double({ min: 0, max: 2, noNaN: true }), fc.constant(Infinity)) }),
  fc.record({ sensor: fc.constantFrom("floor", "front"), mark: fc.integer({ min: 0, max: 4 }) }),
);

const stepArb = fc.record({ action: fc.constantFrom(...ACTIONS), readings: fc.array(readingArb, { maxLength: 5 }) });

describe("filter properties (fast-check)", () => {
  it("beliefs stay normalised, non-negative, finite and zero on blocked tiles after any motion and sense updates", () => {
    fc.assert(
      fc.property(planArb, fc.constantFrom("differential", "bicycle" as const), fc.array(stepArb, { maxLength: 12 }), (plan, drive, steps) => {
        const model = defaultMotion(drive);
        const sensorModel = defaultSensorModel();
        let pure = uniformBelief(plan);
        const filter = createFilter(plan, model, SENSORS, sensorModel);
        for (const { action, readings } of steps) {
          pure = motionUpdate(plan, pure, action, model);
          expectValidBelief(plan, pure);
          pure = senseUpdateDetailed(plan, pure, readings, SENSORS, sensorModel).belief;
          expectValidBelief(plan, pure);
          filter.step(action, readings);
          expectValidBelief(plan, filter.belief);
        }
      }),
      { numRuns: 150, seed: 20240611 },
    );
  });

  it("createFilter gives the same numbers as motionUpdate followed by senseUpdate", () => {
    fc.assert(
      fc.property(planArb, fc.constantFrom("differential", "bicycle" as const), fc.array(stepArb, { minLength: 1, maxLength: 8 }), (plan, drive, steps) => {
        const model = defaultMotion(drive);
        const sensorModel = defaultSensorModel();
        let pure = uniformBelief(plan);
        const filter = createFilter(plan, model, SENSORS, sensorModel);
        for (const [k, { action, readings }] of steps.entries()) {
          pure = motionUpdate(plan, pure, action, model);
          const result = senseUpdateDetailed(plan, pure, readings, SENSORS, sensorModel);
          pure = result.belief;
          const outcome = k % 2 === 0 ? filter.step(action, readings) : (filter.motion(action), filter.sense(readings));
          expect(outcome).toEqual({ fellBack: result.fellBack, ignored: result.ignored });
          const ours = filter.belief;
          for (let s = 0; s < pure.length; s++) expect(Math.abs(ours[s] - pure[s])).toBeLessThan(1e-12);
        }
      }),
      { numRuns: 100, seed: 977 },
    );
  });
});

describe("kidnapped robot", () => {
  // Two rooms split by a wall (column 4), each with a pillar in a different place, so that motion alone can
  // never carry belief from one room to the other and the readings single out one pose.
  const plan = parseFloorplan(["0000100000", "0010100000", "0000100100", "0000100000"].join("\n"), { tileM: 0.5 });
  const sensors = SENSORS.slice(0, 3);
  const readingsAt = (row: number, col: number, heading: number): SensorReading[] =>
    sensors.map((s) => ({ sensor: s.id, rangeM: s.kind === "range" ? castRay(plan, row, col, beamAngleRad(heading, s.bearingDeg), s.maxRangeM) : 0 }));

  /** Drives the true robot around with exact outcomes and returns whether the estimate ends on the true tile. */
  function run(model: MotionModel): { found: boolean; trueTileMass: number } {
    const filter = createFilter(plan, model, sensors, defaultSensorModel());
    filter.reset(poseBelief(plan, { row: 0, col: 0, heading: "E" }));
    // Kidnapped: believed at (0, 0) facing E in the left room, the robot really stands at (3, 9) facing N in the right one.
    let [row, col, heading] = [3, 9, 0];
    const free = (r: number, c: number) => r >= 0 && r < plan.rows && c >= 0 && c < plan.cols && plan.blocked[r * plan.cols + c] === 0;
    for (let k = 0; k < 40; k++) {
      const [dr, dc] = HEADING_STEP[heading];
      const action = free(row + dr, col + dc) ? "forward" : "left";
      if (action === "forward") [row, col] = [row + dr, col + dc];
      else heading = (heading + 3) % 4;
      filter.step(action, readingsAt(row, col, heading));
    }
    const c = certainty(plan, filter.belief);
    const t = (row * plan.cols + col) * 4;
    const b = filter.belief;
    return { found: c.row === row && c.col === col && c.heading === heading, trueTileMass: b[t] + b[t + 1] + b[t + 2] + b[t + 3] };
  }

  it("recovers thanks to the mixing term", () => {
    const outcome = run(defaultMotion("differential"));
    expect(outcome.found).toBe(true);
    expect(outcome.trueTileMass).toBeGreaterThan(0.5);
  });
  it("without mixing, the true pose never gets any mass back", () => {
    const outcome = run({ ...defaultMotion("differential"), mix: 0 });
    expect(outcome.found).toBe(false);
    expect(outcome.trueTileMass).toBe(0);
  });
  it("reset zeroes blocked states and the start state index is stateIndex", () => {
    const filter = createFilter(plan, defaultMotion("bicycle"), sensors, defaultSensorModel());
    const b = new Float64Array(plan.rows * plan.cols * 4).fill(1);
    filter.reset(b);
    expect(filter.belief[stateIndex(plan, 1, 2, 0)]).toBe(0);
    expect(filter.belief[stateIndex(plan, 0, 0, 0)]).toBeCloseTo(1 / (4 * 34), 14);
  });
});
