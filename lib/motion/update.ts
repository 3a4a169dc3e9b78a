/**
 * The histogram filter's prediction step for Tessera: the belief after one
 * tile action, b'(x') = (1 − mix) Σ_x p(x' | x, a) b(x) + mix / N_free on
 * every free state.
 *
 * Assumes a belief indexed by stateIndex, zero on blocked tiles. The mixing
 * term departs from the textbook filter: it keeps a floor of probability on
 * every free state so that a kidnapped robot (moved by hand, wheels slipped)
 * can be found again by later readings, the same purpose as the random
 * particles injected by Augmented MCL (Probabilistic Robotics §8.3.5).
 * Reference: discrete Bayes filter prediction, Probabilistic Robotics §2.4.1
 * and §4.1.
 */
import { fillFreeStates, freeStateCount } from "../belief/normalise";
import type { Floorplan } from "../floorplan/types";
import { stateCount } from "../floorplan/types";
import type { Action } from "../vocabulary";
import { ACTIONS } from "../vocabulary";
import type { MotionModel } from "./model";
import { defaultMotion } from "./model";
import type { TransitionTable } from "./transitions";
import { buildTransitions } from "./transitions";

export interface MotionUpdateOptions {
  /** Buffer for the result (length stateCount, must not be the input belief). */
  out?: Float64Array;
  /** A table built by buildTransitions for this plan and model; built on the spot when omitted (slow). */
  table?: TransitionTable;
}

/** Index of an action in ACTIONS; throws RangeError for anything else. */
export function actionIndex(action: Action | number): number {
  const a = typeof action === "number" ? action : ACTIONS.indexOf(action);
  if (!Number.isInteger(a) || a < 0 || a >= ACTIONS.length) throw new RangeError(`unknown action ${String(action)}`);
  return a;
}

/**
 * Predicted belief after `action`: a new normalised Float64Array (or opts.out), zero on blocked tiles.
 * The input is normalised on the fly; throws RangeError when it has no mass or the sizes disagree.
 */
export function motionUpdate(
  plan: Floorplan,
  belief: ArrayLike<number>,
  action: Action | number,
  model: MotionModel = defaultMotion("differential"),
  opts: MotionUpdateOptions = {},
): Float64Array {
  const a = actionIndex(action);
  const states = stateCount(plan);
  if (belief.length !== states) throw new RangeError(`belief has ${belief.length} entries, plan has ${states} states`);
  const table = opts.table ?? buildTransitions(plan, model);
  if (table.states !== states) throw new RangeError("transition table was built for another plan");
  const out = opts.out ?? new Float64Array(states);
  if (out.length !== states) throw new RangeError("out has the wrong length");
  if ((out as unknown) === (belief as unknown)) throw new RangeError("out must not be the input belief");
  let sumIn = 0;
  for (let s = 0; s < states; s++) sumIn += belief[s];
  if (!(sumIn > 0) || !Number.isFinite(sumIn)) throw new RangeError("belief has no positive finite mass");
  const freeStates = freeStateCount(plan);
  if (freeStates === 0) throw new RangeError("plan has no free tile");
  applyTransitions(table, belief, a, (1 - model.mix) / sumIn, fillFreeStates(plan, out, model.mix / freeStates));
  return out;
}

/** Adds keep × Σ_x p(x' | x, a) b(x) into `out` (which already holds the mixing floor). */
export function applyTransitions(table: TransitionTable, belief: ArrayLike<number>, a: number, keep: number, out: Float64Array): void {
  const { offsets, next, prob } = table;
  const states = table.states;
  for (let s = 0; s < states; s++) {
    const bs = belief[s];
    if (bs === 0) continue;
    const w = bs * keep;
    const end = offsets[s * 4 + a + 1];
    for (let e = offsets[s * 4 + a]; e < end; e++) out[next[e]] += w * prob[e];
  }
}
