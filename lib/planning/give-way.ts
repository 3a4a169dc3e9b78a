/**
 * Where a robot backs off to when another robot needs the tile it stands on and neither can
 * go round the other: two robots meeting in a one-tile doorway, or in a bay with one way in.
 * Re-planning around the other robot cannot help there, because every way to the goal runs
 * through it; one of them has to step aside first.
 */
import { isFreeTile, type Floorplan, type Tile } from "../floorplan";

const STEPS: readonly (readonly [number, number])[] = [
  [-1, 0],
  [0, 1],
  [1, 0],
  [0, -1],
];

/**
 * The nearest tile (in 4-connected moves from `from`) that lies off every tile in `keepClear`,
 * reached without entering any tile in `occupied`; never `from` itself, a blocked tile or a
 * no-go tile. Null when there is none. Ties go to the tile found first in N, E, S, W order,
 * so the same situation always gives the same answer.
 */
export function giveWayTile(plan: Floorplan, from: Tile, occupied: readonly Tile[], keepClear: readonly Tile[]): Tile | null {
  const key = (row: number, col: number) => row * plan.cols + col;
  const closed = new Set(occupied.map((t) => key(t.row, t.col)));
  const clear = new Set(keepClear.map((t) => key(t.row, t.col)));
  const seen = new Set([key(from.row, from.col)]);
  const queue: Tile[] = [from];
  for (let head = 0; head < queue.length; head++) {
    const { row, col } = queue[head];
    for (const [dr, dc] of STEPS) {
      const r = row + dr;
      const c = col + dc;
      const k = key(r, c);
      if (!isFreeTile(plan, r, c) || seen.has(k) || closed.has(k)) continue;
      seen.add(k);
      if (!clear.has(k) && plan.nogo[k] === 0) return { row: r, col: c };
      queue.push({ row: r, col: c });
    }
  }
  return null;
}

/** True when `tile` is one of `route`'s tiles. */
export function onRoute(route: readonly Tile[], tile: Tile): boolean {
  return route.some((t) => t.row === tile.row && t.col === tile.col);
}
