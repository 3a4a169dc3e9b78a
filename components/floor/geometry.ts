/**
 * Floor-view geometry in tile units: the map's SVG user space is one unit per tile,
 * x = column, y = row (row 0 at the top), so (col + 0.5, row + 0.5) is a tile's centre.
 */
import type { FloorplanView } from "@/lib/protocol/ops-feed";
import { HEADINGS, type Heading } from "@/lib/vocabulary";

export type TileKind = "free" | "blocked" | "nogo" | "dock" | "mark";

export interface TileCoord {
  row: number;
  col: number;
}

/** What a tile is, in drawing precedence: blocked over no-go over dock over mark over free. */
export function tileKind(plan: FloorplanView, row: number, col: number): TileKind {
  const i = row * plan.cols + col;
  if (plan.blocked[i]) return "blocked";
  if (plan.nogo[i]) return "nogo";
  if (plan.dock[i]) return "dock";
  if (plan.mark[i]) return "mark";
  return "free";
}

/** Tiles of one kind, with the floor mark class of each (0 when unmarked). */
export function tilesOfKind(plan: FloorplanView, kind: Exclude<TileKind, "free">): (TileCoord & { mark: number })[] {
  const out: (TileCoord & { mark: number })[] = [];
  for (let row = 0; row < plan.rows; row++) {
    for (let col = 0; col < plan.cols; col++) {
      if (tileKind(plan, row, col) === kind) out.push({ row, col, mark: plan.mark[row * plan.cols + col] ?? 0 });
    }
  }
  return out;
}

/** Why a tile cannot be a goal, in the operator's words, or null when it can. */
export function goalRefusal(plan: FloorplanView, row: number, col: number): string | null {
  if (!Number.isInteger(row) || !Number.isInteger(col) || row < 0 || col < 0 || row >= plan.rows || col >= plan.cols) {
    return `Tile (${row}, ${col}) is outside the floorplan (${plan.rows} rows × ${plan.cols} columns)`;
  }
  const kind = tileKind(plan, row, col);
  if (kind === "blocked") return `Goal tile (${row}, ${col}) is blocked`;
  if (kind === "nogo") return `Goal tile (${row}, ${col}) is a no-go tile`;
  return null;
}

/** The tile under a point given in tile units, or null outside the plan. */
export function tileAtPoint(plan: Pick<FloorplanView, "rows" | "cols">, x: number, y: number): TileCoord | null {
  if (!Number.isFinite(x) || !Number.isFinite(y)) return null;
  const col = Math.floor(x);
  const row = Math.floor(y);
  if (row < 0 || col < 0 || row >= plan.rows || col >= plan.cols) return null;
  return { row, col };
}

/** Screen rotation of a heading in degrees, clockwise from north (N 0, E 90, S 180, W 270). */
export function headingRotationDeg(heading: Heading): number {
  return HEADINGS.indexOf(heading) * 90;
}

/** SVG points of a polyline through tile centres, starting at `from` when given. */
export function routePoints(route: readonly TileCoord[], from?: TileCoord | null): string {
  const tiles = from ? [from, ...route] : route;
  return tiles.map((t) => `${t.col + 0.5},${t.row + 0.5}`).join(" ");
}

/** Certainty in [0, 1] clamped, for the ring arc; NaN counts as 0. */
export function ringFraction(tileMass: number): number {
  if (!(tileMass > 0)) return 0;
  return Math.min(1, tileMass);
}

/** Horizontal runs of tiles of one kind, as [row, firstCol, length], so a wall of n tiles draws as one rect. */
export function tileRuns(plan: FloorplanView, kind: Exclude<TileKind, "free">): [number, number, number][] {
  const runs: [number, number, number][] = [];
  for (let row = 0; row < plan.rows; row++) {
    let start = -1;
    for (let col = 0; col <= plan.cols; col++) {
      const inside = col < plan.cols && tileKind(plan, row, col) === kind;
      if (inside && start < 0) start = col;
      if (!inside && start >= 0) {
        runs.push([row, start, col - start]);
        start = -1;
      }
    }
  }
  return runs;
}
