/**
 * Exact deterministic shortest routes over (tile, heading) states for a differential drive.
 *
 * Moves: `forward` goes one tile along the heading when that tile is free, `left`/`right` turn
 * 90° in place; costs come from MotionModel.cost (forward per tile, turn per quarter turn).
 * Assumes positive finite costs and that the outside of the plan is blocked. A bump (forward into
 * a blocked tile) only adds cost and never shortens a route, so it is left out of the graph.
 * `shortestTurns` runs Dijkstra forward from one pose and stops at the goal tile (any heading);
 * `costToGoal` runs it backward from the goal over every state, the planner's warm start and the
 * deterministic reference for its tests. Unreachable states are marked −1, never Infinity.
 * Reference: Dijkstra, "A note on two problems in connexion with graphs" (1959); binary-heap
 * variant as in Cormen et al., "Introduction to Algorithms" (3rd ed.), §24.3, from memory.
 */
import type { Floorplan, Tile } from "../floorplan/types";
import { isFreeTile, stateCount } from "../floorplan/types";
import { defaultMotion, type MotionModel } from "../motion";
import { HEADINGS, HEADING_STEP, type Action, type Heading } from "../vocabulary";
import { IndexedMinHeap } from "./min-heap";

/** Cost per forward tile and per quarter turn, in cost units (> 0); MotionModel.cost fits. */
export type RouteCost = Pick<MotionModel["cost"], "forward" | "turn">;

/** A pose on the tile grid; heading is an index 0..3 into HEADINGS or its letter. */
export interface TilePose {
  row: number;
  col: number;
  heading: number | Heading;
}

function resolveCost(cost: RouteCost | undefined): RouteCost {
  const resolved = cost ?? defaultMotion("differential").cost;
  if (!(resolved.forward > 0) || !(resolved.turn > 0) || !Number.isFinite(resolved.forward) || !Number.isFinite(resolved.turn)) {
    throw new RangeError("route costs must be positive and finite");
  }
  return resolved;
}

function checkTile(name: string, tile: Tile): void {
  if (!Number.isInteger(tile.row) || !Number.isInteger(tile.col)) throw new RangeError(`${name}: row and col must be integers`);
}

function headingIndex(heading: number | Heading): number {
  const index = typeof heading === "number" ? heading : HEADINGS.indexOf(heading);
  if (!Number.isInteger(index) || index < 0 || index > 3) throw new RangeError(`heading must be 0..3 or one of ${HEADINGS.join(", ")}`);
  return index;
}

/**
 * Deterministic cost-to-go to the goal tile for every state (length rows·cols·4, indexed by stateIndex):
 * 0 on the goal tile, −1 on blocked states and where the goal cannot be reached (also when the goal is blocked or outside).
 */
export function costToGoal(plan: Floorplan, goal: Tile, cost?: RouteCost): Float64Array {
  return costToGoalInOrder(plan, goal, cost).value;
}

/**
 * costToGoal plus the reached states in the order Dijkstra settled them (non-decreasing cost,
 * goal states first); `count` states of `order` are used. The planner's warm start.
 */
export function costToGoalInOrder(plan: Floorplan, goal: Tile, cost?: RouteCost): { value: Float64Array; order: Int32Array; count: number } {
  checkTile("costToGoal", goal);
  const { forward, turn } = resolveCost(cost);
  const { cols } = plan;
  const states = stateCount(plan);
  const dist = new Float64Array(states).fill(Infinity);
  const order = new Int32Array(states);
  let count = 0;
  if (isFreeTile(plan, goal.row, goal.col)) {
    const done = new Uint8Array(states);
    const heap = new IndexedMinHeap(states, dist);
    const goalBase = (goal.row * cols + goal.col) * 4;
    for (let h = 0; h < 4; h++) {
      dist[goalBase + h] = 0;
      heap.pushOrDecrease(goalBase + h);
    }
    const blocked = plan.blocked;
    const rows = plan.rows;
    while (heap.size > 0) {
      const s = heap.pop();
      done[s] = 1;
      order[count++] = s;
      const d = dist[s];
      const tile = s >> 2;
      const h = s & 3;
      // Predecessors: a turn from the neighbouring headings on this tile, or a forward step from the tile behind.
      const viaTurn = d + turn;
      const fromLeftTurn = (tile << 2) | ((h + 1) & 3);
      if (!done[fromLeftTurn] && viaTurn < dist[fromLeftTurn]) {
        dist[fromLeftTurn] = viaTurn;
        heap.pushOrDecrease(fromLeftTurn);
      }
      const fromRightTurn = (tile << 2) | ((h + 3) & 3);
      if (!done[fromRightTurn] && viaTurn < dist[fromRightTurn]) {
        dist[fromRightTurn] = viaTurn;
        heap.pushOrDecrease(fromRightTurn);
      }
      const row = (tile / cols) | 0;
      const col = tile - row * cols;
      const step = HEADING_STEP[h];
      const backRow = row - step[0];
      const backCol = col - step[1];
      if (backRow >= 0 && backRow < rows && backCol >= 0 && backCol < cols) {
        const backTile = backRow * cols + backCol;
        const from = (backTile << 2) | h;
        const viaForward = d + forward;
        if (blocked[backTile] === 0 && !done[from] && viaForward < dist[from]) {
          dist[from] = viaForward;
          heap.pushOrDecrease(from);
        }
      }
    }
  }
  for (let s = 0; s < states; s++) if (dist[s] === Infinity) dist[s] = -1;
  return { value: dist, order, count };
}

/**
 * Cheapest action sequence from a pose to the goal tile (any final heading) for a differential drive,
 * with its total cost; null when the start is blocked or outside, or the goal cannot be reached.
 */
export function shortestTurns(plan: Floorplan, from: TilePose, goal: Tile, cost?: RouteCost): { cost: number; actions: Action[] } | null {
  checkTile("shortestTurns", from);
  checkTile("shortestTurns", goal);
  const start = headingIndex(from.heading);
  const { forward, turn } = resolveCost(cost);
  if (!isFreeTile(plan, from.row, from.col) || !isFreeTile(plan, goal.row, goal.col)) return null;

  const { cols } = plan;
  const states = stateCount(plan);
  const dist = new Float64Array(states).fill(Infinity);
  const parent = new Int32Array(states).fill(-1);
  const via = new Uint8Array(states);
  const done = new Uint8Array(states);
  const heap = new IndexedMinHeap(states, dist);
  const goalTile = goal.row * cols + goal.col;
  const startState = (from.row * cols + from.col) * 4 + start;
  dist[startState] = 0;
  heap.pushOrDecrease(startState);

  const relax = (s: number, next: number, d: number, action: number) => {
    if (!done[next] && d < dist[next]) {
      dist[next] = d;
      parent[next] = s;
      via[next] = action;
      heap.pushOrDecrease(next);
    }
  };

  let reached = -1;
  while (heap.size > 0) {
    const s = heap.pop();
    done[s] = 1;
    const tile = s >> 2;
    if (tile === goalTile) {
      reached = s;
      break;
    }
    const h = s & 3;
    const d = dist[s];
    const row = (tile / cols) | 0;
    const col = tile - row * cols;
    const [dr, dc] = HEADING_STEP[h];
    if (isFreeTile(plan, row + dr, col + dc)) relax(s, ((row + dr) * cols + (col + dc)) * 4 + h, d + forward, 0);
    relax(s, (tile << 2) | ((h + 3) & 3), d + turn, 1);
    relax(s, (tile << 2) | ((h + 1) & 3), d + turn, 2);
  }
  if (reached < 0) return null;

  const actions: Action[] = [];
  for (let s = reached; s !== startState; s = parent[s]) actions.push(via[s] === 0 ? "forward" : via[s] === 1 ? "left" : "right");
  actions.reverse();
  return { cost: dist[reached], actions };
}
