/**
 * Generic value iteration and iterative policy evaluation for small, explicitly given MDPs.
 *
 * Computes V(s) = max_a Σ_s' P(s'|s,a)·(r(s,a,s') + γ·V(s')) with terminal states held at 0,
 * and, for a fixed stochastic policy π, V(s) = Σ_a π(a|s) Σ_s' P(s'|s,a)·(r + γ·V(s')).
 * Assumes a finite MDP whose transition lists sum to 1 per available action; an action with an
 * empty list is unavailable in that state. With γ = 1 every policy considered must reach a terminal.
 * Departs from the textbook in two ways: sweeps are in place (Gauss–Seidel), which reaches the same
 * fixed point in fewer sweeps, and the stop test is the largest change in one sweep (< epsilon)
 * rather than the ε(1−γ)/γ error bound, so the bound also works for γ = 1. The reward sits on the
 * transition (s, a, s'), so a terminal's own reward is paid on entering it.
 * References: Russell and Norvig, AIMA 3rd ed., §17.2 (value iteration); Sutton and Barto,
 * "Reinforcement Learning" 2nd ed., §4.1 (iterative policy evaluation, in-place variant).
 * This is the reference solver for the textbook worlds; the floor planner uses the specialised
 * sweep in plan-policy.ts.
 */

/** An MDP over states 0..states−1 and actions 0..actions−1, given by callbacks. */
export interface Mdp {
  states: number;
  actions: number;
  /** Outcomes [next, probability] of taking action a in s; empty when a is unavailable in s. */
  transitions(s: number, a: number): ReadonlyArray<readonly [number, number]>;
  /** Reward received on the transition s --a--> next. */
  reward(s: number, a: number, next: number): number;
  /** True for absorbing states whose value is fixed at 0. */
  terminal?(s: number): boolean;
}

/** discount γ in [0, 1]; epsilon > 0 bounds the largest value change of the last sweep; maxSweeps caps the work. */
export interface SolveOptions {
  discount: number;
  epsilon: number;
  maxSweeps?: number;
}

/** Values, greedy policy (−1 on terminals and action-less states), sweeps done, and whether epsilon was met. */
export interface MdpSolution {
  value: Float64Array;
  policy: Int32Array;
  sweeps: number;
  converged: boolean;
}

const DEFAULT_MAX_SWEEPS = 100_000;

function checkOptions(mdp: Mdp, opts: SolveOptions): number {
  if (!Number.isInteger(mdp.states) || mdp.states < 0 || !Number.isInteger(mdp.actions) || mdp.actions < 1) {
    throw new RangeError("solveMdp: states must be a non-negative integer and actions a positive integer");
  }
  if (!(opts.discount >= 0 && opts.discount <= 1)) throw new RangeError("solveMdp: discount must lie in [0, 1]");
  if (!(opts.epsilon > 0)) throw new RangeError("solveMdp: epsilon must be positive");
  const maxSweeps = opts.maxSweeps ?? DEFAULT_MAX_SWEEPS;
  if (!Number.isInteger(maxSweeps) || maxSweeps < 1) throw new RangeError("solveMdp: maxSweeps must be a positive integer");
  return maxSweeps;
}

function actionValue(mdp: Mdp, value: Float64Array, discount: number, s: number, a: number): number | null {
  const outcomes = mdp.transitions(s, a);
  if (outcomes.length === 0) return null;
  let q = 0;
  for (const [next, p] of outcomes) q += p * (mdp.reward(s, a, next) + discount * value[next]);
  return q;
}

/**
 * In-place (Gauss–Seidel) sweeps over the non-terminal states: `backup(s)` gives the new value of s
 * (null keeps it), until no value changes by epsilon or maxSweeps is reached.
 */
function sweepUntilStill(
  value: Float64Array,
  isTerminal: Uint8Array,
  maxSweeps: number,
  epsilon: number,
  backup: (s: number) => number | null,
): { sweeps: number; converged: boolean } {
  let sweeps = 0;
  let converged = false;
  while (sweeps < maxSweeps && !converged) {
    let change = 0;
    for (let s = 0; s < value.length; s++) {
      if (isTerminal[s]) continue;
      const next = backup(s);
      if (next === null) continue;
      const delta = Math.abs(next - value[s]);
      if (delta > change) change = delta;
      value[s] = next;
    }
    sweeps++;
    converged = change < epsilon;
  }
  return { sweeps, converged };
}

/** Value iteration maximising expected total discounted reward; see the module header for the stop rule. */
export function solveMdp(mdp: Mdp, opts: SolveOptions): MdpSolution {
  const maxSweeps = checkOptions(mdp, opts);
  const { states, actions } = mdp;
  const value = new Float64Array(states);
  const policy = new Int32Array(states).fill(-1);
  const isTerminal = new Uint8Array(states);
  for (let s = 0; s < states; s++) isTerminal[s] = mdp.terminal?.(s) ? 1 : 0;

  const { sweeps, converged } = sweepUntilStill(value, isTerminal, maxSweeps, opts.epsilon, (s) => {
    let best = -Infinity;
    for (let a = 0; a < actions; a++) {
      const q = actionValue(mdp, value, opts.discount, s, a);
      if (q !== null && q > best) best = q;
    }
    return best === -Infinity ? null : best;
  });

  for (let s = 0; s < states; s++) {
    if (isTerminal[s]) continue;
    let best = -Infinity;
    for (let a = 0; a < actions; a++) {
      const q = actionValue(mdp, value, opts.discount, s, a);
      if (q !== null && q > best) {
        best = q;
        policy[s] = a;
      }
    }
  }
  return { value, policy, sweeps, converged };
}

/**
 * Iterative policy evaluation of a fixed stochastic policy: probability(s, a) = π(a|s), summing to 1
 * over the available actions of each non-terminal state. Same stop rule as solveMdp.
 */
export function evaluatePolicy(
  mdp: Mdp,
  probability: (s: number, a: number) => number,
  opts: SolveOptions,
): { value: Float64Array; sweeps: number; converged: boolean } {
  const maxSweeps = checkOptions(mdp, opts);
  const { states, actions } = mdp;
  const value = new Float64Array(states);
  const isTerminal = new Uint8Array(states);
  for (let s = 0; s < states; s++) isTerminal[s] = mdp.terminal?.(s) ? 1 : 0;

  const { sweeps, converged } = sweepUntilStill(value, isTerminal, maxSweeps, opts.epsilon, (s) => {
    let v = 0;
    for (let a = 0; a < actions; a++) {
      const weight = probability(s, a);
      if (weight === 0) continue;
      const q = actionValue(mdp, value, opts.discount, s, a);
      if (q === null) throw new RangeError(`evaluatePolicy: policy gives weight to unavailable action ${a} in state ${s}`);
      v += weight * q;
    }
    return v;
  });
  return { value, sweeps, converged };
}
