import { describe, expect, it } from "vitest";
import { parseFloorplan } from "../floorplan/parse";
import { stateIndex } from "../floorplan/types";
import { certainty, poseBelief, tileMarginal, uniformBelief } from "./belief";
import { beliefSum, freeStateCount, normalised } from "./normalise";

const plan = parseFloorplan("0010\n0000\n1000\n");

describe("beliefs", () => {
  it("uniformBelief spreads 1 over the 40 free states and leaves blocked tiles at 0", () => {
    const b = uniformBelief(plan);
    expect(b.length).toBe(48);
    expect(freeStateCount(plan)).toBe(40);
    expect(b[stateIndex(plan, 0, 2, 1)]).toBe(0);
    expect(b[stateIndex(plan, 1, 3, 2)]).toBe(1 / 40);
    expect(beliefSum(b)).toBeCloseTo(1, 14);
  });
  it("poseBelief puts the mass on one state, or spreads it over headings and nearby free tiles", () => {
    const one = poseBelief(plan, { row: 1, col: 1, heading: "S" });
    expect(one[stateIndex(plan, 1, 1, 2)]).toBe(1);
    const headings = poseBelief(plan, { row: 1, col: 1 });
    expect(headings[stateIndex(plan, 1, 1, 0)]).toBe(0.25);
    const spread = poseBelief(plan, { row: 1, col: 1, heading: 1 }, 1);
    // Weights 1 at the centre, 1 − 1/2 at the four neighbours at distance 1 (all free): 1 + 4 · 0.5 = 3.
    expect(spread[stateIndex(plan, 1, 1, 1)]).toBeCloseTo(1 / 3, 14);
    expect(spread[stateIndex(plan, 0, 1, 1)]).toBeCloseTo(0.5 / 3, 14);
    expect(spread[stateIndex(plan, 0, 0, 1)]).toBe(0);
    const nearWall = poseBelief(plan, { row: 1, col: 0, heading: 0 }, 1);
    // (2,0) is blocked and (1,-1) is outside: 1 + 2 · 0.5 = 2.
    expect(nearWall[stateIndex(plan, 1, 0, 0)]).toBeCloseTo(0.5, 14);
    expect(() => poseBelief(plan, { row: 2, col: 0 })).toThrow(RangeError);
  });
  it("certainty: the most likely state, its tile's mass, and entropy 1 for uniform, 0 for one state", () => {
    expect(certainty(plan, uniformBelief(plan)).entropy).toBeCloseTo(1, 12);
    const sharp = certainty(plan, poseBelief(plan, { row: 2, col: 3, heading: "W" }));
    expect(sharp).toEqual({ row: 2, col: 3, heading: 3, tileMass: 1, entropy: 0 });
    const b = new Float64Array(48);
    b[stateIndex(plan, 0, 3, 0)] = 0.5;
    b[stateIndex(plan, 1, 2, 1)] = 0.3;
    b[stateIndex(plan, 1, 2, 2)] = 0.2;
    const c = certainty(plan, b);
    expect([c.row, c.col, c.heading, c.tileMass]).toEqual([0, 3, 0, 0.5]);
    const h = -(0.5 * Math.log(0.5) + 0.3 * Math.log(0.3) + 0.2 * Math.log(0.2)) / Math.log(40);
    expect(c.entropy).toBeCloseTo(h, 14);
  });
  it("tileMarginal sums the four headings of every tile", () => {
    const b = normalised(Float64Array.from({ length: 48 }, (_, s) => (plan.blocked[s >> 2] ? 0 : (s % 5) + 1)));
    const m = tileMarginal(plan, b);
    expect(m.length).toBe(12);
    expect(m[5]).toBeCloseTo(b[20] + b[21] + b[22] + b[23], 6);
    expect(m[8]).toBe(0);
  });
});
