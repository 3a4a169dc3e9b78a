/**
 * The floor planner: an optimal policy over (tile, heading) states to one goal tile, minimising
 * expected total action cost under Tessera's stochastic tile motion model.
 *
 * A stochastic shortest-path MDP on the shared transition table (buildTransitions): each action
 * costs model.cost.forward or model.cost.turn, plus model.cost.bump on outcomes marked bumped;
 * `stay` costs one forward step, so it is never optimal off the goal. The goal tile is terminal in
 * every heading with value 0. The mixing term of the model belongs to the filter and is ignored.
 * Steps:
 * 1. States from which the goal can be reached at all (with positive probability) are kept; the
 *    rest are dead ends, marked value −1 and action NO_ACTION. An outcome that enters a dead end
 *    ends the mission at a finite penalty (opts.deadEndCost) instead of an infinite expected cost:
 *    a bicycle cannot turn on the spot, and under the default model every one of its actions may
 *    run straight on, so without the penalty every state of a walled plan would be improper.
 * 2. Warm start: a deterministic cost-to-go by Dijkstra — costToGoal for a differential drive, else
 *    Dijkstra backward over each action's most likely outcome — which orders the tiles.
 * 3. Block Gauss–Seidel value iteration: tiles in warm-start order, each tile's four headings iterated
 *    together (turn outcomes stay on the tile), until the largest change of a sweep is below epsilon.
 * Departures from textbook value iteration, none of which moves the fixed point: in-place sweeps in
 * warm-start order over tile blocks; each action's self-loop (stall, failed turn, bump) solved in
 * closed form, Q = (Σ_{s'≠s} p·(c + V(s')) + p_self·c) / (1 − p_self); values started a little
 * above the deterministic cost (×1.1 plus one forward step), because from below the headings of a
 * tile climb out of turn-in-place cycles only one turn cost per iteration. Value iteration for a
 * stochastic shortest path with positive costs converges from any finite start.
 * The sweeps run over a copy of the table compacted in sweep order (the first sweep runs while it
 * is built), because gathering the table in warm-start order is memory-bound.
 * On the goal tile the action is `stay` (index 3), not NO_ACTION, so a robot there is told to hold.
 * A goal outside the plan, on a blocked tile or on a no-go tile is unreachable: every value −1.
 * References: Bertsekas and Tsitsiklis, "Neuro-Dynamic Programming" (1996), §2.2 (stochastic
 * shortest paths, Gauss–Seidel value iteration); Kolobov, Mausam and Weld, "A Theory of
 * Goal-Oriented MDPs with Dead Ends" (UAI 2012), finite dead-end penalty; both from memory.
 */
import type { Floorplan, Tile } from "../floorplan/types";
import { stateCount } from "../floorplan/types";
import { buildTransitions, defaultMotion, type MotionModel, type TransitionTable } from "../motion";
import { NO_ACTION } from "../vocabulary";
import { IndexedMinHeap } from "./min-heap";
import { costToGoalInOrder } from "./shortest-turns";

/** Index of `stay` in ACTIONS. */
const STAY = 3;
/** A self-loop probability this close to 1 means the action never leaves the state. */
const SELF_LOOP_LIMIT = 1 - 1e-12;
/** Cap on the joint iterations of one tile's headings within a sweep. */
const MAX_BLOCK_ROUNDS = 64;
/** A tile's headings are iterated until they move less than this fraction of the previous sweep's change (or epsilon). */
const INNER_FRACTION = 0.01;
/** Warm values start at deterministic cost × WARM_SCALE + one forward step (see the module header). */
const WARM_SCALE = 1.1;

/** epsilon: stop when a sweep changes no value by this much (cost units, default 1e-5); maxSweeps default 1000. */
export interface PlanOptions {
  /** Transition table of `model` on this plan, to reuse across goals (it does not depend on the goal). */
  table?: TransitionTable;
  epsilon?: number;
  maxSweeps?: number;
  /** Called after each sweep with its number (from 1) and its largest value change. */
  onSweep?: (sweep: number, change: number) => void;
  /** Cost of entering a dead end (no route to the goal left), cost units; default 1000 forward steps. */
  deadEndCost?: number;
}

/**
 * A policy: value = expected cost-to-go per state (0 on the goal tile, −1 where unreachable or blocked);
 * action = ACTIONS index per state (stay on the goal tile, NO_ACTION where unreachable or blocked).
 */
export interface Policy {
  value: Float64Array;
  action: Uint8Array;
  goal: Tile;
  model: MotionModel;
  sweeps: number;
  converged: boolean;
}

/** Per-action base cost in ACTIONS order (forward, left, right, stay = one forward step), cost units. */
export function actionCosts(model: MotionModel): Float64Array {
  const { forward, turn, bump } = model.cost;
  if (![forward, turn, bump].every((c) => Number.isFinite(c) && c >= 0) || !(forward > 0) || !(turn > 0)) {
    throw new RangeError("motion model costs must be finite, forward and turn positive, bump non-negative");
  }
  return Float64Array.of(forward, turn, turn, forward);
}

function unreachablePolicy(states: number, goal: Tile, model: MotionModel): Policy {
  return {
    value: new Float64Array(states).fill(-1),
    action: new Uint8Array(states).fill(NO_ACTION),
    goal,
    model,
    sweeps: 0,
    converged: true,
  };
}

/** Entry e of pair (s, a) leads into next[e]; the reversed view lists, per state, the entries leading into it. */
interface ReversedTable {
  /** Pair s·4 + a owning each entry. */
  entryPair: Int32Array;
  /** Entries leading into state t are reverseEntry[reverseOffsets[t] .. reverseOffsets[t+1]). */
  reverseOffsets: Int32Array;
  reverseEntry: Int32Array;
}

function reverseTable(table: TransitionTable): ReversedTable {
  const { states, offsets, next } = table;
  const pairs = states * 4;
  const entries = offsets[pairs];
  const entryPair = new Int32Array(entries);
  for (let pair = 0; pair < pairs; pair++) {
    const end = offsets[pair + 1];
    for (let e = offsets[pair]; e < end; e++) entryPair[e] = pair;
  }
  const reverseOffsets = new Int32Array(states + 1);
  for (let e = 0; e < entries; e++) reverseOffsets[next[e] + 1]++;
  for (let s = 0; s < states; s++) reverseOffsets[s + 1] += reverseOffsets[s];
  const fill = reverseOffsets.slice(0, states);
  const reverseEntry = new Int32Array(entries);
  for (let e = 0; e < entries; e++) reverseEntry[fill[next[e]]++] = e;
  return { entryPair, reverseOffsets, reverseEntry };
}

/** Which states can still reach the goal, and the warm-start order of the kept non-goal states. */
interface Start {
  kept: Uint8Array;
  order: Int32Array;
}

/**
 * Generic start for any table: the states that reach the goal with positive probability (a search
 * backward over the reversed table), then Dijkstra backward over each action's most likely outcome,
 * writing the deterministic cost into `value`. Kept states that Dijkstra never reaches come last.
 */
function genericStart(table: TransitionTable, goalBase: number, cost: Float64Array, bumpCost: number, value: Float64Array): Start {
  const { states, offsets, prob, bumped } = table;
  const { entryPair, reverseOffsets, reverseEntry } = reverseTable(table);
  const kept = new Uint8Array(states);
  const queue = new Int32Array(states);
  let head = 0;
  let tail = 0;
  for (let h = 0; h < 4; h++) {
    kept[goalBase + h] = 1;
    queue[tail++] = goalBase + h;
  }
  while (head < tail) {
    const target = queue[head++];
    const end = reverseOffsets[target + 1];
    for (let r = reverseOffsets[target]; r < end; r++) {
      const s = entryPair[reverseEntry[r]] >> 2;
      if (kept[s]) continue;
      kept[s] = 1;
      queue[tail++] = s;
    }
  }

  const pairs = states * 4;
  const nominal = new Int32Array(pairs);
  for (let pair = 0; pair < pairs; pair++) {
    const end = offsets[pair + 1];
    let best = -1;
    for (let e = offsets[pair]; e < end; e++) if (best < 0 || prob[e] > prob[best]) best = e;
    nominal[pair] = best;
  }
  value.fill(Infinity);
  const settled = new Uint8Array(states);
  const order = new Int32Array(states);
  let ordered = 0;
  const heap = new IndexedMinHeap(states, value);
  for (let h = 0; h < 4; h++) {
    value[goalBase + h] = 0;
    heap.pushOrDecrease(goalBase + h);
  }
  while (heap.size > 0) {
    const target = heap.pop();
    settled[target] = 1;
    if (target < goalBase || target >= goalBase + 4) order[ordered++] = target;
    const d = value[target];
    const end = reverseOffsets[target + 1];
    for (let r = reverseOffsets[target]; r < end; r++) {
      const e = reverseEntry[r];
      const pair = entryPair[e];
      if (nominal[pair] !== e) continue;
      const s = pair >> 2;
      if (settled[s]) continue;
      const candidate = d + cost[pair & 3] + (bumped[e] ? bumpCost : 0);
      if (candidate < value[s]) {
        value[s] = candidate;
        heap.pushOrDecrease(s);
      }
    }
  }
  let highest = 0;
  for (let i = 0; i < ordered; i++) if (value[order[i]] > highest) highest = value[order[i]];
  for (let s = 0; s < states; s++) {
    if (kept[s] && !settled[s]) {
      value[s] = highest;
      order[ordered++] = s;
    }
    if (!kept[s]) value[s] = 0;
  }
  return { kept, order: order.subarray(0, ordered) };
}

/**
 * Start for a differential drive with forward.ok > 0 and turn.ok > 0: every deterministic route then
 * has positive probability and no outcome leaves the goal's connected region, so the states of finite
 * deterministic cost are exactly those that can reach the goal, and there are no dead ends to enter.
 */
function differentialStart(plan: Floorplan, goal: Tile, model: MotionModel, value: Float64Array): Start {
  const states = value.length;
  const start = costToGoalInOrder(plan, goal, model.cost);
  const kept = new Uint8Array(states);
  for (let s = 0; s < states; s++) {
    const d = start.value[s];
    kept[s] = d >= 0 ? 1 : 0;
    value[s] = d >= 0 ? d : 0;
  }
  return { kept, order: start.order.subarray(4, start.count) };
}

/**
 * The Bellman backups of the kept non-goal states, in sweep order, with each action's self-loop solved:
 * Q(s, a) = pairConstant + Σ weight·V(target) over the outcomes that leave s for another kept state
 * (outcomes into dead ends are folded into pairConstant with their penalty).
 */
interface SweepTable {
  /** States in sweep order, grouped into tile blocks order[blockStart[b] .. blockStart[b+1]). */
  order: Int32Array;
  blockStart: Int32Array;
  blocks: number;
  /** Candidate actions of order[i] are pairs stateStart[i] .. stateStart[i+1). */
  stateStart: Int32Array;
  pairAction: Uint8Array;
  pairConstant: Float64Array;
  /** Outcomes of pair j are pairStart[j] .. pairStart[j+1). */
  pairStart: Int32Array;
  target: Int32Array;
  weight: Float64Array;
}

/** Bellman backup of the state at sweep position i; stores and returns its new value. */
function backup(t: SweepTable, i: number, value: Float64Array, action: Uint8Array): number {
  const { stateStart, pairAction, pairConstant, pairStart, target, weight } = t;
  let best = Infinity;
  let bestAction = NO_ACTION;
  const pairEnd = stateStart[i + 1];
  for (let j = stateStart[i]; j < pairEnd; j++) {
    let q = pairConstant[j];
    const end = pairStart[j + 1];
    for (let e = pairStart[j]; e < end; e++) q += weight[e] * value[target[e]];
    if (q < best) {
      best = q;
      bestAction = pairAction[j];
    }
  }
  const s = t.order[i];
  value[s] = best;
  action[s] = bestAction;
  return best;
}

/** Iterates the headings of block b together until they move less than `tolerance`; returns their largest total change. */
function updateBlock(t: SweepTable, b: number, value: Float64Array, action: Uint8Array, tolerance: number, before: Float64Array): number {
  const { order, blockStart } = t;
  const first = blockStart[b];
  const end = blockStart[b + 1];
  for (let i = first; i < end; i++) before[i - first] = value[order[i]];
  for (let round = 0; round < MAX_BLOCK_ROUNDS; round++) {
    let inner = 0;
    for (let i = first; i < end; i++) {
      const old = value[order[i]];
      const now = backup(t, i, value, action);
      const delta = now > old ? now - old : old - now;
      if (delta > inner) inner = delta;
    }
    if (inner < tolerance) break;
  }
  let change = 0;
  for (let i = first; i < end; i++) {
    const delta = Math.abs(value[order[i]] - before[i - first]);
    if (delta > change) change = delta;
  }
  return change;
}

/** One block Gauss–Seidel sweep over all tiles in order; returns the largest value change. */
function sweepBlocks(t: SweepTable, value: Float64Array, action: Uint8Array, tolerance: number, before: Float64Array): number {
  let change = 0;
  for (let b = 0; b < t.blocks; b++) {
    const blockChange = updateBlock(t, b, value, action, tolerance, before);
    if (blockChange > change) change = blockChange;
  }
  return change;
}

/**
 * Builds the sweep table from the warm-start order — tiles in order of their first state, each tile's
 * kept headings by increasing warm value — and runs the first sweep block by block as it goes, while
 * that block's table entries are still in cache. Returns the table and the first sweep's change.
 */
function compactAndSweep(
  table: TransitionTable,
  start: Start,
  cost: Float64Array,
  bumpCost: number,
  deadEndCost: number,
  goalTile: number,
  value: Float64Array,
  action: Uint8Array,
  epsilon: number,
  before: Float64Array,
): { sweepTable: SweepTable; change: number } {
  const { offsets, next, prob, bumped, states } = table;
  const { kept } = start;
  const m = start.order.length;
  const order = new Int32Array(m);
  const blockStart = new Int32Array(m + 1);
  const stateStart = new Int32Array(m + 1);
  const pairAction = new Uint8Array(m * 4);
  const pairConstant = new Float64Array(m * 4);
  const pairStart = new Int32Array(m * 4 + 1);
  // Sized for the whole table: pages that are never written are never touched.
  const target = new Int32Array(offsets[states * 4]);
  const weight = new Float64Array(offsets[states * 4]);
  const sweepTable: SweepTable = { order, blockStart, blocks: 0, stateStart, pairAction, pairConstant, pairStart, target, weight };
  const seen = new Uint8Array(states >> 2);
  seen[goalTile] = 1;
  let at = 0;
  let pairCount = 0;
  let entryCount = 0;
  let change = 0;
  for (let i = 0; i < m; i++) {
    const tile = start.order[i] >> 2;
    if (seen[tile]) continue;
    seen[tile] = 1;
    const first = at;
    for (let h = 0; h < 4; h++) {
      const s = (tile << 2) | h;
      if (!kept[s]) continue;
      let k = at++;
      while (k > first && value[order[k - 1]] > value[s]) {
        order[k] = order[k - 1];
        k--;
      }
      order[k] = s;
    }
    for (let k = first; k < at; k++) {
      const s = order[k];
      stateStart[k] = pairCount;
      for (let a = 0; a < 4; a++) {
        const pair = s * 4 + a;
        const end = offsets[pair + 1];
        const firstEntry = entryCount;
        let self = 0;
        let expectedCost = 0;
        for (let e = offsets[pair]; e < end; e++) {
          const p = prob[e];
          expectedCost += p * (bumped[e] ? cost[a] + bumpCost : cost[a]);
          const n = next[e];
          if (n === s) {
            self += p;
          } else if (!kept[n]) {
            expectedCost += p * deadEndCost;
          } else {
            target[entryCount] = n;
            weight[entryCount] = p;
            entryCount++;
          }
        }
        // An action that never leaves s (stay, or a certain bump) would cost forever: no candidate.
        if (self >= SELF_LOOP_LIMIT) {
          entryCount = firstEntry;
          continue;
        }
        const scale = 1 / (1 - self);
        for (let e = firstEntry; e < entryCount; e++) weight[e] *= scale;
        pairAction[pairCount] = a;
        pairConstant[pairCount] = expectedCost * scale;
        pairStart[pairCount] = firstEntry;
        pairCount++;
      }
    }
    stateStart[at] = pairCount;
    pairStart[pairCount] = entryCount;
    blockStart[sweepTable.blocks] = first;
    blockStart[sweepTable.blocks + 1] = at;
    const blockChange = updateBlock(sweepTable, sweepTable.blocks, value, action, epsilon, before);
    if (blockChange > change) change = blockChange;
    sweepTable.blocks++;
  }
  return { sweepTable, change };
}

/** Optimal policy to `goal` under `model` (default: differential defaults); see the module header. */
export function planPolicy(plan: Floorplan, goal: Tile, model: MotionModel = defaultMotion("differential"), opts: PlanOptions = {}): Policy {
  if (!Number.isInteger(goal.row) || !Number.isInteger(goal.col)) throw new RangeError("planPolicy: goal row and col must be integers");
  const epsilon = opts.epsilon ?? 1e-5;
  const maxSweeps = opts.maxSweeps ?? 1000;
  if (!(epsilon > 0)) throw new RangeError("planPolicy: epsilon must be positive");
  if (!Number.isInteger(maxSweeps) || maxSweeps < 1) throw new RangeError("planPolicy: maxSweeps must be a positive integer");
  const cost = actionCosts(model);
  const bumpCost = model.cost.bump;
  const deadEndCost = opts.deadEndCost ?? 1000 * cost[0];
  if (!(deadEndCost > 0) || !Number.isFinite(deadEndCost)) throw new RangeError("planPolicy: deadEndCost must be positive and finite");
  const states = stateCount(plan);
  const { rows, cols } = plan;
  const goalCopy = { row: goal.row, col: goal.col };
  if (goal.row < 0 || goal.row >= rows || goal.col < 0 || goal.col >= cols) return unreachablePolicy(states, goalCopy, model);
  const goalTile = goal.row * cols + goal.col;
  if (plan.blocked[goalTile] !== 0 || plan.nogo[goalTile] !== 0) return unreachablePolicy(states, goalCopy, model);

  const table = opts.table ?? buildTransitions(plan, model);
  if (table.states !== states || table.offsets.length !== states * 4 + 1) throw new RangeError("planPolicy: table does not match the plan");
  const goalBase = goalTile * 4;
  const value = new Float64Array(states);
  const start =
    model.drive === "differential" && model.forward.ok > 0 && model.turn.ok > 0
      ? differentialStart(plan, goalCopy, model, value)
      : genericStart(table, goalBase, cost, bumpCost, value);
  for (let i = 0; i < start.order.length; i++) {
    const s = start.order[i];
    value[s] = value[s] * WARM_SCALE + cost[0];
  }

  const action = new Uint8Array(states).fill(NO_ACTION);
  const before = new Float64Array(4);
  const first = compactAndSweep(table, start, cost, bumpCost, deadEndCost, goalTile, value, action, epsilon, before);
  const { sweepTable } = first;
  let sweeps = 1;
  let converged = first.change < epsilon;
  opts.onSweep?.(1, first.change);
  let previous = first.change;
  while (sweeps < maxSweeps && !converged) {
    const change = sweepBlocks(sweepTable, value, action, Math.max(epsilon, INNER_FRACTION * previous), before);
    previous = change;
    sweeps++;
    converged = change < epsilon;
    opts.onSweep?.(sweeps, change);
  }

  for (let h = 0; h < 4; h++) {
    value[goalBase + h] = 0;
    action[goalBase + h] = STAY;
  }
  for (let s = 0; s < states; s++) if (!start.kept[s]) value[s] = -1;
  return { value, action, goal: goalCopy, model, sweeps, converged };
}
