/** The route a policy would take from a pose, following each action's most likely outcome. */
import { stateIndex, type Floorplan, type Tile } from "../../lib/floorplan";
import type { TransitionTable } from "../../lib/motion";
import { NO_ACTION } from "../../lib/vocabulary";
import type { RobotRuntime } from "./robot-runtime";

/** The most likely next state after action `a` from state `s`; `s` itself when there is none. */
export function likelyNext(table: TransitionTable, s: number, a: number): number {
  let best = s;
  let bestP = -1;
  for (let e = table.offsets[s * 4 + a]; e < table.offsets[s * 4 + a + 1]; e++) {
    if (table.prob[e] > bestP) {
      bestP = table.prob[e];
      best = table.next[e];
    }
  }
  return best;
}

/** The tile the robot most likely ends on after action `a` from state `s`. */
export function likelyTile(plan: Floorplan, table: TransitionTable, s: number, a: number): Tile {
  const t = likelyNext(table, s, a) >> 2;
  return { row: Math.floor(t / plan.cols), col: t % plan.cols };
}

/** Tiles visited from state `start` under the policy's actions, goal last; at most `limit` tiles. */
export function routePreview(plan: Floorplan, table: TransitionTable, action: Uint8Array, start: number, goal: Tile, limit = 256): Tile[] {
  const route: Tile[] = [];
  let s = start;
  const seen = new Set<number>();
  for (let i = 0; i < limit * 4; i++) {
    const tile = s >> 2;
    const row = Math.floor(tile / plan.cols);
    const col = tile % plan.cols;
    const last = route[route.length - 1];
    if (!last || last.row !== row || last.col !== col) route.push({ row, col });
    if ((row === goal.row && col === goal.col) || route.length >= limit) break;
    const a = action[s];
    if (a === NO_ACTION || seen.has(s)) break;
    seen.add(s);
    s = likelyNext(table, s, a);
  }
  return route;
}

/** The route of a robot's mission from its most likely pose, under the policy it follows now (or `policy`); empty without a mission. */
export function missionRoute(runtime: RobotRuntime, policy?: { action: Uint8Array }): Tile[] {
  const m = runtime.mission;
  if (!m) return [];
  const c = runtime.certainty();
  const here = stateIndex(runtime.plan, c.row, c.col, c.heading);
  return routePreview(runtime.plan, runtime.filter.table, (policy ?? m.detour ?? m.policy).action, here, m.goal);
}
