import { describe, expect, it } from "vitest";
import { parseFloorplan } from "../floorplan/parse";
import { stateIndex } from "../floorplan/types";
import { dualModeState } from "./dual-mode";

const plan = parseFloorplan("0 0 0 0\n0 1 0 0\n", { tileM: 0.3 });

/** A belief with `mass` on each [row, col, heading] state and none elsewhere. */
function beliefOf(entries: [row: number, col: number, heading: number, mass: number][]): Float64Array {
  const belief = new Float64Array(plan.rows * plan.cols * 4);
  for (const [row, col, heading, mass] of entries) belief[stateIndex(plan, row, col, heading)] = mass;
  return belief;
}

describe("the state a spread belief acts as", () => {
  it("is the most likely state when it lies off the goal", () => {
    const belief = beliefOf([
      [0, 0, 1, 0.5],
      [1, 3, 0, 0.3],
      [0, 3, 2, 0.2],
    ]);
    expect(dualModeState(plan, belief, { row: 0, col: 3 })).toBe(stateIndex(plan, 0, 0, 1));
  });

  it("passes over the goal tile when the belief is split between the goal and a look-alike", () => {
    const belief = beliefOf([
      [0, 3, 1, 0.48],
      [0, 3, 2, 0.04],
      [1, 0, 1, 0.46],
      [0, 1, 0, 0.02],
    ]);
    expect(dualModeState(plan, belief, { row: 0, col: 3 })).toBe(stateIndex(plan, 1, 0, 1));
  });

  it("answers -1 when the whole belief is on the goal", () => {
    expect(dualModeState(plan, beliefOf([[1, 2, 3, 1]]), { row: 1, col: 2 })).toBe(-1);
  });
});
