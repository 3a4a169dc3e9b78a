/**
 * The door example of the discrete Bayes filter, Thrun, Burgard and Fox,
 * Probabilistic Robotics (2005), §2.4.2, run through Tessera's generic
 * update functions (motionUpdate with an explicit transition table, and
 * correctInto with an explicit likelihood factor) on a 1 × 2 "floorplan":
 * tile 0 = door open, tile 1 = door closed, heading N only.
 */
import Fraction from "fraction.js";
import { describe, expect, it } from "vitest";
import { emptyFloorplan } from "../floorplan/plan";
import type { MotionModel } from "../motion/model";
import type { TransitionTable } from "../motion/transitions";
import { motionUpdate } from "../motion/update";
import type { ReadingFactor } from "../sensing/update";
import { correctInto } from "../sensing/update";

const plan = emptyFloorplan(1, 2);
plan.mark[0] = 2; // the open door
plan.mark[1] = 3; // the closed door
const OPEN = 0; // state (0, 0, N)
const CLOSED = 4; // state (0, 1, N)

/** push = action 0 ("forward"): open stays open (1); closed opens with 0.8, stays closed 0.2. do-nothing = "stay". Other headings: identity. */
function doorTable(): TransitionTable {
  const offsets: number[] = [];
  const next: number[] = [];
  const prob: number[] = [];
  for (let s = 0; s < 8; s++) {
    for (let a = 0; a < 4; a++) {
      offsets.push(next.length);
      if (a === 0 && s === CLOSED) {
        next.push(OPEN, CLOSED);
        prob.push(0.8, 0.2);
      } else {
        next.push(s);
        prob.push(1);
      }
    }
  }
  offsets.push(next.length);
  return { states: 8, offsets: Int32Array.from(offsets), next: Int32Array.from(next), prob: Float64Array.from(prob), bumped: new Uint8Array(next.length) };
}

const noMix: MotionModel = { drive: "differential", forward: { ok: 1, stall: 0, over: 0 }, turn: { ok: 1, none: 0, reverse: 0 }, mix: 0, cost: { forward: 1, turn: 1, bump: 1 } };

/** p(z | door) as a factor over mark classes: sense open 0.6 | open, 0.2 | closed; sense closed 0.4 | open, 0.8 | closed (§2.4.2). */
function senseFactor(z: "open" | "closed"): ReadingFactor {
  const factor = new Float64Array(256);
  factor[2] = z === "open" ? 0.6 : 0.4;
  factor[3] = z === "open" ? 0.2 : 0.8;
  return { kind: "floor", factor };
}

function step(prior: Float64Array, action: "forward" | "stay", z: "open" | "closed"): Float64Array {
  const predicted = motionUpdate(plan, prior, action, noMix, { table: doorTable() });
  const out = new Float64Array(8);
  const fellBack = correctInto(plan, predicted, [senseFactor(z)], out, 0.05);
  expect(fellBack).toBe(false);
  return out;
}

/** The same filter in exact rationals, written from the book's equations. */
function exactStep(open: Fraction, action: "push" | "nothing", z: "open" | "closed"): Fraction {
  const closed = new Fraction(1).sub(open);
  const predOpen = action === "push" ? open.add(closed.mul(new Fraction(4, 5))) : open;
  const predClosed = new Fraction(1).sub(predOpen);
  const likeOpen = z === "open" ? new Fraction(3, 5) : new Fraction(2, 5);
  const likeClosed = z === "open" ? new Fraction(1, 5) : new Fraction(4, 5);
  const a = likeOpen.mul(predOpen);
  return a.div(a.add(likeClosed.mul(predClosed)));
}

describe("door example (Probabilistic Robotics §2.4.2)", () => {
  const prior = new Float64Array(8);
  prior[OPEN] = 0.5;
  prior[CLOSED] = 0.5;

  it("t=1, do nothing then sense open: open 0.75 (exactly 3/4)", () => {
    const b1 = step(prior, "stay", "open");
    const exact = exactStep(new Fraction(1, 2), "nothing", "open");
    expect(exact.equals(new Fraction(3, 4))).toBe(true);
    expect(b1[OPEN]).toBeCloseTo(0.75, 15);
    expect(b1[CLOSED]).toBeCloseTo(0.25, 15);
    expect(new Fraction(b1[OPEN]).simplify(1e-12).equals(exact)).toBe(true);
  });

  it("t=2, push (predicted 0.95 / 0.05) then sense open: open 57/58, closed 1/58", () => {
    const b1 = step(prior, "stay", "open");
    const predicted = motionUpdate(plan, b1, "forward", noMix, { table: doorTable() });
    expect(predicted[OPEN]).toBeCloseTo(0.95, 15);
    expect(predicted[CLOSED]).toBeCloseTo(0.05, 15);
    const b2 = step(b1, "forward", "open");
    const exact = exactStep(new Fraction(3, 4), "push", "open");
    expect(exact.equals(new Fraction(57, 58))).toBe(true);
    expect(new Fraction(b2[OPEN]).simplify(1e-12).equals(new Fraction(57, 58))).toBe(true);
    expect(new Fraction(b2[CLOSED]).simplify(1e-12).equals(new Fraction(1, 58))).toBe(true);
    expect(b2[OPEN]).toBeCloseTo(0.983, 3);
  });

  it("t=2 with sense closed instead (derived in CHECKS.md, not in the book): open 19/21, closed 2/21", () => {
    const b1 = step(prior, "stay", "open");
    const b2 = step(b1, "forward", "closed");
    const exact = exactStep(new Fraction(3, 4), "push", "closed");
    expect(exact.equals(new Fraction(19, 21))).toBe(true);
    expect(new Fraction(b2[OPEN]).simplify(1e-12).equals(new Fraction(19, 21))).toBe(true);
    expect(new Fraction(b2[CLOSED]).simplify(1e-12).equals(new Fraction(2, 21))).toBe(true);
    expect(b2[OPEN] + b2[CLOSED]).toBeCloseTo(1, 15);
  });
});
