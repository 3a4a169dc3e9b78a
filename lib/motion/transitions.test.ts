import { matrix, multiply, zeros } from "mathjs";
import type { Matrix } from "mathjs";
import { describe, expect, it } from "vitest";
import { parseFloorplan } from "../floorplan/parse";
import type { Floorplan } from "../floorplan/types";
import { stateIndex } from "../floorplan/types";
import { HEADINGS } from "../vocabulary";
import type { MotionModel } from "./model";
import { defaultMotion } from "./model";
import { buildTransitions } from "./transitions";
import { motionUpdate } from "./update";

// An asymmetric plan: 3 rows × 4 cols, two blocked tiles, no mirror symmetry.
const plan = parseFloorplan("0 0 0 1\n0 1 0 0\n0 0 0 0\n", { tileM: 0.5 });
const N = 0;
const E = 1;
const S = 2;
const W = 3;

function outcomes(p: Floorplan, model: MotionModel, row: number, col: number, heading: number, action: number) {
  const table = buildTransitions(p, model);
  const s = stateIndex(p, row, col, heading);
  const list: { row: number; col: number; heading: string; p: number; bumped: number }[] = [];
  for (let e = table.offsets[s * 4 + action]; e < table.offsets[s * 4 + action + 1]; e++) {
    const n = table.next[e];
    list.push({ row: Math.floor(n / 4 / p.cols), col: (n >> 2) % p.cols, heading: HEADINGS[n & 3], p: Math.round(table.prob[e] * 1e12) / 1e12, bumped: table.bumped[e] });
  }
  return list.sort((a, b) => b.p - a.p);
}

const diff: MotionModel = { drive: "differential", forward: { ok: 0.7, stall: 0.2, over: 0.1 }, turn: { ok: 0.85, none: 0.1, reverse: 0.05 }, mix: 0, cost: { forward: 1, turn: 0.5, bump: 4 } };
const bike: MotionModel = { ...diff, drive: "bicycle" };

describe("buildTransitions, differential", () => {
  it("forward: ok one tile, stall stays, over two tiles", () => {
    expect(outcomes(plan, diff, 2, 0, E, 0)).toEqual([
      { row: 2, col: 1, heading: "E", p: 0.7, bumped: 0 },
      { row: 2, col: 0, heading: "E", p: 0.2, bumped: 0 },
      { row: 2, col: 2, heading: "E", p: 0.1, bumped: 0 },
    ]);
  });
  it("forward with the second tile blocked stops after one (bumped); with the first blocked it stays (bumped)", () => {
    // (2,1) heading N: (1,1) is blocked.
    expect(outcomes(plan, diff, 2, 1, N, 0)).toEqual([
      { row: 2, col: 1, heading: "N", p: 0.8, bumped: 1 },
      { row: 2, col: 1, heading: "N", p: 0.2, bumped: 0 },
    ]);
    // (1,2) heading N: (0,2) free, (-1,2) outside.
    expect(outcomes(plan, diff, 1, 2, N, 0)).toEqual([
      { row: 0, col: 2, heading: "N", p: 0.7, bumped: 0 },
      { row: 1, col: 2, heading: "N", p: 0.2, bumped: 0 },
      { row: 0, col: 2, heading: "N", p: 0.1, bumped: 1 },
    ]);
  });
  it("left turns counter-clockwise, right clockwise; none stays; reverse turns 180°", () => {
    expect(outcomes(plan, diff, 0, 0, N, 1).map((o) => [o.heading, o.p])).toEqual([
      ["W", 0.85],
      ["N", 0.1],
      ["S", 0.05],
    ]);
    expect(outcomes(plan, diff, 0, 0, N, 2).map((o) => [o.heading, o.p])).toEqual([
      ["E", 0.85],
      ["N", 0.1],
      ["S", 0.05],
    ]);
  });
  it("stay is the identity; blocked states have no entries; each free (s, a) sums to 1", () => {
    const table = buildTransitions(plan, defaultMotion("differential"));
    const blocked = stateIndex(plan, 1, 1, S);
    for (let a = 0; a < 4; a++) expect(table.offsets[blocked * 4 + a + 1] - table.offsets[blocked * 4 + a]).toBe(0);
    expect(outcomes(plan, diff, 2, 3, W, 3)).toEqual([{ row: 2, col: 3, heading: "W", p: 1, bumped: 0 }]);
    for (let s = 0; s < table.states; s++) {
      if (plan.blocked[s >> 2]) continue;
      for (let a = 0; a < 4; a++) {
        let sum = 0;
        for (let e = table.offsets[s * 4 + a]; e < table.offsets[s * 4 + a + 1]; e++) sum += table.prob[e];
        expect(sum).toBeCloseTo(1, 12);
      }
    }
  });
  it("rejects a model with negative or all-zero weights (programmer error)", () => {
    expect(() => buildTransitions(plan, { ...diff, forward: { ok: -0.1, stall: 0.6, over: 0.5 } })).toThrow(RangeError);
    expect(() => buildTransitions(plan, { ...diff, turn: { ok: 0, none: 0, reverse: 0 } })).toThrow(RangeError);
  });
});

describe("buildTransitions, bicycle", () => {
  it("heading N at (r, c), left arcs to (r−1, c−1) heading W; right to (r−1, c+1) heading E", () => {
    const open = parseFloorplan("000\n000\n000\n");
    expect(outcomes(open, bike, 2, 1, N, 1)).toEqual([
      { row: 1, col: 0, heading: "W", p: 0.85, bumped: 0 },
      { row: 2, col: 1, heading: "N", p: 0.1, bumped: 0 },
      { row: 1, col: 1, heading: "N", p: 0.05, bumped: 0 },
    ]);
    expect(outcomes(open, bike, 2, 1, N, 2)[0]).toEqual({ row: 1, col: 2, heading: "E", p: 0.85, bumped: 0 });
    expect(outcomes(open, bike, 1, 1, E, 2)[0]).toEqual({ row: 2, col: 2, heading: "S", p: 0.85, bumped: 0 });
  });
  it("an arc into a blocked or outside tile, or across a blocked tile ahead, stays put (bumped)", () => {
    // (2,2) heading N, left ends at (1,1), blocked.
    expect(outcomes(plan, bike, 2, 2, N, 1)[0]).toEqual({ row: 2, col: 2, heading: "N", p: 0.85, bumped: 1 });
    // (2,1) heading N: the tile ahead (1,1) is blocked, so neither the arc nor the straight-on failure can move;
    // both bumps land on the same state and are merged, the unbumped failure to turn is kept apart.
    expect(outcomes(plan, bike, 2, 1, N, 2)).toEqual([
      { row: 2, col: 1, heading: "N", p: 0.9, bumped: 1 },
      { row: 2, col: 1, heading: "N", p: 0.1, bumped: 0 },
    ]);
    // (0,0) heading W: ahead is outside; the arc's and the straight-on failure's bumps merge.
    expect(outcomes(plan, bike, 0, 0, W, 2)[0]).toEqual({ row: 0, col: 0, heading: "W", p: 0.9, bumped: 1 });
  });
});

describe("motionUpdate against an explicit transition matrix (mathjs)", () => {
  /** The dense matrix M[next][prev] of a differential forward move, written out from the rules in the model's header. */
  function forwardMatrix(p: Floorplan, m: MotionModel): Matrix {
    const n = p.rows * p.cols * 4;
    const M = zeros(n, n) as Matrix;
    const free = (r: number, c: number) => r >= 0 && r < p.rows && c >= 0 && c < p.cols && p.blocked[r * p.cols + c] === 0;
    const step = [
      [-1, 0],
      [0, 1],
      [1, 0],
      [0, -1],
    ];
    const add = (to: number, from: number, v: number) => M.set([to, from], (M.get([to, from]) as number) + v);
    for (let r = 0; r < p.rows; r++) {
      for (let c = 0; c < p.cols; c++) {
        if (!free(r, c)) continue;
        for (let h = 0; h < 4; h++) {
          const s = (r * p.cols + c) * 4 + h;
          const [dr, dc] = step[h];
          const one = free(r + dr, c + dc) ? ((r + dr) * p.cols + c + dc) * 4 + h : s;
          const two = free(r + dr, c + dc) && free(r + 2 * dr, c + 2 * dc) ? ((r + 2 * dr) * p.cols + c + 2 * dc) * 4 + h : one;
          add(one, s, m.forward.ok);
          add(s, s, m.forward.stall);
          add(two, s, m.forward.over);
        }
      }
    }
    return M;
  }

  it("equals (1 − mix)·M·b + mix/N_free on an asymmetric plan", () => {
    const model: MotionModel = { ...diff, mix: 0.03 };
    const n = plan.rows * plan.cols * 4;
    const belief = new Float64Array(n);
    // distinct, asymmetric masses on free states
    let w = 1;
    for (let s = 0; s < n; s++) if (plan.blocked[s >> 2] === 0) belief[s] = w++ * (s % 3 === 0 ? 2 : 1);
    let sum = 0;
    for (const v of belief) sum += v;
    for (let s = 0; s < n; s++) belief[s] /= sum;
    const freeStates = 4 * 10;
    const product = multiply(forwardMatrix(plan, model), matrix(Array.from(belief))) as Matrix;
    const ours = motionUpdate(plan, belief, "forward", model);
    for (let s = 0; s < n; s++) {
      const expected = plan.blocked[s >> 2] ? 0 : (1 - model.mix) * (product.get([s]) as number) + model.mix / freeStates;
      expect(ours[s]).toBeCloseTo(expected, 14);
    }
    expect(ours.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 14);
  });

  it("writes into opts.out, uses opts.table, and refuses the input as out", () => {
    const model = defaultMotion("differential");
    const table = buildTransitions(plan, model);
    const belief = new Float64Array(48);
    belief[stateIndex(plan, 2, 0, E)] = 1;
    const out = new Float64Array(48);
    expect(motionUpdate(plan, belief, "forward", model, { out, table })).toBe(out);
    expect(out[stateIndex(plan, 2, 1, E)]).toBeCloseTo(0.8 * (1 - model.mix) + model.mix / 40, 14);
    expect(() => motionUpdate(plan, belief, "forward", model, { out: belief, table })).toThrow(RangeError);
    expect(() => motionUpdate(plan, new Float64Array(48), "forward", model, { table })).toThrow(RangeError);
  });
});
