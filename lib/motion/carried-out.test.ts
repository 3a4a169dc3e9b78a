import { describe, expect, it } from "vitest";
import { parseFloorplan } from "../floorplan/parse";
import { stateIndex } from "../floorplan/types";
import { actionCarriedOut } from "./carried-out";
import { motionUpdate } from "./update";

const TILE_M = 0.3048;

describe("the action a moved report carried out", () => {
  it("keeps the commanded action when the odometry shows it happened, or when there is no odometry", () => {
    expect(actionCarriedOut("forward", { distanceM: 0.29, turnDeg: 0.4 }, TILE_M)).toBe("forward");
    expect(actionCarriedOut("left", { distanceM: 0, turnDeg: 89.2 }, TILE_M)).toBe("left");
    expect(actionCarriedOut("right", { distanceM: 0.47, turnDeg: -90.5 }, TILE_M)).toBe("right");
    expect(actionCarriedOut("forward", undefined, TILE_M)).toBe("forward");
    expect(actionCarriedOut("stay", { distanceM: 0.3, turnDeg: 90 }, TILE_M)).toBe("stay");
  });

  it("predicts no move for a bumped forward and a turn that did not turn, and a straight move for a bicycle whose steering failed", () => {
    expect(actionCarriedOut("forward", { distanceM: 0.0001, turnDeg: 0 }, TILE_M)).toBe("stay");
    expect(actionCarriedOut("left", { distanceM: 0, turnDeg: 1.05 }, TILE_M)).toBe("stay");
    expect(actionCarriedOut("right", { distanceM: 0.3, turnDeg: -2 }, TILE_M)).toBe("forward");
  });

  it("holds a wedged robot's belief in place where the commanded forward would carry it off", () => {
    // One free row; the robot is known at (0, 1) facing E and reports forwards that did not travel.
    const plan = parseFloorplan("0 0 0 0 0\n", { tileM: TILE_M });
    let belief: Float64Array = new Float64Array(plan.rows * plan.cols * 4);
    belief[stateIndex(plan, 0, 1, 1)] = 1;
    for (let i = 0; i < 5; i++) belief = motionUpdate(plan, belief, actionCarriedOut("forward", { distanceM: 0.0001, turnDeg: 0 }, TILE_M));
    expect(belief[stateIndex(plan, 0, 1, 1)]).toBeGreaterThan(0.95);
  });
});
