/**
 * QMDP action choice: the action of least belief-weighted expected cost-to-go under a planned policy.
 *
 * For each action a: Q(b, a) = Σ_s b(s) Σ_s' T(s, a, s')·(c(s, a, s') + V(s')), with T and c from the
 * same transition table and costs the planner used (planPolicy), V the policy's value.
 * Assumes the belief is indexed like the policy (stateIndex) and sums to 1 over free states.
 * Departures from the textbook QMDP: when more than `goalMass` (default 0.5) of the belief sits on the
 * goal tile the answer is `stay`, since the goal is terminal and QMDP would otherwise keep paying to
 * leave it; on goal states `stay` costs 0 (terminal) while other actions pay their cost and land
 * off the goal; states with value −1 (no route to the goal) count as a large finite cost-to-go,
 * twice the largest finite value plus 100 forward steps, so that no Infinity enters the sums.
 * Reference: Littman, Cassandra and Kaelbling, "Learning policies for partially observable
 * environments: scaling up" (ICML 1995), the QMDP approximation; from memory.
 */
import type { Floorplan } from "../floorplan/types";
import { stateCount } from "../floorplan/types";
import { buildTransitions, defaultMotion, type MotionModel, type TransitionTable } from "../motion";
import { ACTIONS, type Action } from "../vocabulary";
import { actionCosts } from "./plan-policy";

const STAY = 3;

/** A policy as planPolicy returns it (or as loaded from storage: value and action, model optional). */
export interface PolicyLike {
  value: Float64Array;
  action?: Uint8Array;
  model?: MotionModel;
}

/**
 * model: the motion model the policy was planned with (default policy.model, else differential defaults);
 * table: its transition table on this plan, to avoid rebuilding it on every call (recommended in a loop);
 * goalMass: belief mass on the goal tile above which the answer is `stay`.
 */
export interface ChooseOptions {
  model?: MotionModel;
  table?: TransitionTable;
  goalMass?: number;
}

/**
 * QMDP expected cost of each action in ACTIONS order (cost units), and the belief mass on the goal.
 * Goal states are recognised as those with value 0 (all action costs are positive).
 */
export function qmdpCosts(plan: Floorplan, policy: PolicyLike, belief: ArrayLike<number>, opts: ChooseOptions = {}): { cost: Float64Array; goalMass: number } {
  const states = stateCount(plan);
  if (policy.value.length !== states || belief.length !== states) throw new RangeError("qmdpCosts: policy and belief must have rows·cols·4 entries");
  const model = opts.model ?? policy.model ?? defaultMotion("differential");
  const table = opts.table ?? buildTransitions(plan, model);
  if (table.states !== states) throw new RangeError("qmdpCosts: table does not match the plan");
  const base = actionCosts(model);
  const bumpCost = model.cost.bump;
  const { value } = policy;
  const { offsets, next, prob, bumped } = table;

  let highest = 0;
  for (let s = 0; s < states; s++) if (value[s] > highest) highest = value[s];
  const unreachableCost = 2 * highest + 100 * base[0];

  const cost = new Float64Array(4);
  let goalMass = 0;
  for (let s = 0; s < states; s++) {
    const weight = belief[s];
    if (!(weight > 0)) continue;
    const onGoal = value[s] === 0;
    if (onGoal) goalMass += weight;
    for (let a = 0; a < 4; a++) {
      const lo = offsets[s * 4 + a];
      const hi = offsets[s * 4 + a + 1];
      if (onGoal && a === STAY) continue;
      let q = 0;
      for (let e = lo; e < hi; e++) {
        const v = value[next[e]];
        q += prob[e] * (base[a] + (bumped[e] ? bumpCost : 0) + (v < 0 ? unreachableCost : v));
      }
      // A belief entry on a blocked state has no outcomes; it counts as lost.
      cost[a] += weight * (hi > lo ? q : unreachableCost);
    }
  }
  return { cost, goalMass };
}

/** QMDP action for a belief: `stay` when the goal tile holds more than goalMass of it, else the least expected cost (ties to the earlier action). */
export function chooseAction(plan: Floorplan, policy: PolicyLike, belief: ArrayLike<number>, opts: ChooseOptions = {}): Action {
  const threshold = opts.goalMass ?? 0.5;
  if (!(threshold >= 0 && threshold <= 1)) throw new RangeError("chooseAction: goalMass must lie in [0, 1]");
  const { cost, goalMass } = qmdpCosts(plan, policy, belief, opts);
  if (goalMass > threshold) return "stay";
  let best = 0;
  for (let a = 1; a < 4; a++) if (cost[a] < cost[best]) best = a;
  return ACTIONS[best];
}
