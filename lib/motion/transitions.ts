/**
 * The sparse transition table of Tessera's tile motion model: for every state
 * s = stateIndex(plan, row, col, heading) and action a (ACTIONS order), the
 * outcome states and their probabilities. The filter's motion update and the
 * planner both read this one table, so they agree on what an action does.
 *
 * Assumes the outside of the plan is blocked. A move whose target is blocked
 * leaves the robot where it was, with its heading unchanged, and the outcome is
 * marked `bumped`. Forward overshoot: if the second tile is blocked the robot
 * stops after one tile (bumped, since it ran into the wall); if the first is
 * blocked it stays (bumped). A bicycle arc needs both the tile ahead (which
 * the quarter circle crosses) and the end tile free; otherwise it stays, bumped.
 * Outcomes that land on the same state with the same bump flag are merged;
 * outcomes of one action that land on the same state with different flags are
 * kept apart so that the planner can charge the bump cost.
 *
 * Reference: the discrete motion model of the histogram filter, Thrun,
 * Burgard and Fox, Probabilistic Robotics (2005), §4.1; the mixing term is
 * not part of this table (see motionUpdate).
 */
import type { Floorplan } from "../floorplan/types";
import { isFreeTile, stateCount } from "../floorplan/types";
import { ACTIONS, HEADING_STEP } from "../vocabulary";
import type { MotionModel } from "./model";

/** Sparse transition table over states s = stateIndex(plan,row,col,heading) and action index a (ACTIONS order). Entries for (s,a) are at [offsets[s*4+a], offsets[s*4+a+1]). Excludes the mixing term. Blocked states have no entries. */
export interface TransitionTable {
  states: number;
  offsets: Int32Array;
  next: Int32Array;
  prob: Float64Array;
  /** 1 where that outcome was a bump into a wall/blocked tile */
  bumped: Uint8Array;
}

const ACTION_COUNT = ACTIONS.length;
/** At most three outcomes for forward, left and right, one for stay. */
const MAX_ENTRIES_PER_STATE = 10;

function outcomeWeights(name: string, weights: readonly number[]): number[] {
  let sum = 0;
  for (const w of weights) {
    if (!(w >= 0) || !Number.isFinite(w)) throw new RangeError(`motion model ${name}: weights must be finite and non-negative`);
    sum += w;
  }
  if (!(sum > 0)) throw new RangeError(`motion model ${name}: weights must have a positive sum`);
  return weights.map((w) => w / sum);
}

/** Builds the transition table of `model` on `plan`; probabilities of each (s, a) sum to 1 on free states. Throws RangeError on a malformed model. */
export function buildTransitions(plan: Floorplan, model: MotionModel): TransitionTable {
  const [fwdOk, fwdStall, fwdOver] = outcomeWeights("forward", [model.forward.ok, model.forward.stall, model.forward.over]);
  const [turnOk, turnNone, turnReverse] = outcomeWeights("turn", [model.turn.ok, model.turn.none, model.turn.reverse]);
  const states = stateCount(plan);
  const { cols } = plan;
  const offsets = new Int32Array(states * ACTION_COUNT + 1);
  const capacity = states * MAX_ENTRIES_PER_STATE;
  const next = new Int32Array(capacity);
  const prob = new Float64Array(capacity);
  const bumped = new Uint8Array(capacity);
  let count = 0;
  let groupStart = 0;

  const add = (target: number, p: number, bump: number): void => {
    if (p === 0) return;
    for (let e = groupStart; e < count; e++) {
      if (next[e] === target && bumped[e] === bump) {
        prob[e] += p;
        return;
      }
    }
    next[count] = target;
    prob[count] = p;
    bumped[count] = bump;
    count++;
  };

  for (let s = 0; s < states; s++) {
    const tile = s >> 2;
    const heading = s & 3;
    const row = (tile / cols) | 0;
    const col = tile - row * cols;
    if (plan.blocked[tile] !== 0) {
      for (let a = 0; a < ACTION_COUNT; a++) offsets[s * ACTION_COUNT + a] = count;
      continue;
    }
    const [dr, dc] = HEADING_STEP[heading];
    const free1 = isFreeTile(plan, row + dr, col + dc);
    const ahead1 = ((row + dr) * cols + (col + dc)) * 4 + heading;
    const free2 = free1 && isFreeTile(plan, row + 2 * dr, col + 2 * dc);
    const ahead2 = ((row + 2 * dr) * cols + (col + 2 * dc)) * 4 + heading;
    const base = tile * 4;

    // forward
    groupStart = count;
    offsets[s * ACTION_COUNT] = count;
    if (free1) add(ahead1, fwdOk, 0);
    else add(s, fwdOk, 1);
    add(s, fwdStall, 0);
    if (!free1) add(s, fwdOver, 1);
    else if (free2) add(ahead2, fwdOver, 0);
    else add(ahead1, fwdOver, 1);

    // left (counter-clockwise, side heading + 3) then right (clockwise, side heading + 1)
    for (const [a, turnSteps] of [
      [1, 3],
      [2, 1],
    ] as const) {
      groupStart = count;
      offsets[s * ACTION_COUNT + a] = count;
      const side = (heading + turnSteps) & 3;
      if (model.drive === "differential") {
        add(base + side, turnOk, 0);
        add(s, turnNone, 0);
        add(base + ((heading + 2) & 3), turnReverse, 0);
      } else {
        const [sr, sc] = HEADING_STEP[side];
        const endRow = row + dr + sr;
        const endCol = col + dc + sc;
        if (free1 && isFreeTile(plan, endRow, endCol)) add((endRow * cols + endCol) * 4 + side, turnOk, 0);
        else add(s, turnOk, 1);
        add(s, turnNone, 0);
        if (free1) add(ahead1, turnReverse, 0);
        else add(s, turnReverse, 1);
      }
    }

    // stay
    groupStart = count;
    offsets[s * ACTION_COUNT + 3] = count;
    add(s, 1, 0);
  }
  offsets[states * ACTION_COUNT] = count;
  return {
    states,
    offsets,
    next: next.slice(0, count),
    prob: prob.slice(0, count),
    bumped: bumped.slice(0, count),
  };
}
