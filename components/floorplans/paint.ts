/**
 * The tile editor's edits as pure functions over a Floorplan: one brush applied to a set
 * of tiles, a straight stroke between two pointer samples, a rectangle, and a resize.
 * Each returns a new plan (the input is never changed), or the same object when nothing
 * changed, so the undo history records only real edits.
 *
 * The brushes keep the plan valid for lib/floorplan's readers: marks, docks and no-go
 * tiles exist only on free tiles, so blocking a tile clears them and any of them frees it.
 */
import type { Floorplan, Tile } from "@/lib/floorplan/types";

export type Brush = { kind: "free" } | { kind: "blocked" } | { kind: "mark"; mark: number } | { kind: "dock" } | { kind: "nogo" };

function clonePlan(plan: Floorplan): Floorplan {
  return { ...plan, blocked: plan.blocked.slice(), mark: plan.mark.slice(), dock: plan.dock.slice(), nogo: plan.nogo.slice() };
}

/** Writes the brush into tile index i of `plan` (mutates); true when a layer changed. */
function paintIndex(plan: Floorplan, i: number, brush: Brush): boolean {
  const before = [plan.blocked[i], plan.mark[i], plan.dock[i], plan.nogo[i]];
  switch (brush.kind) {
    case "free":
      plan.blocked[i] = 0;
      plan.mark[i] = 0;
      plan.dock[i] = 0;
      plan.nogo[i] = 0;
      break;
    case "blocked":
      plan.blocked[i] = 1;
      plan.mark[i] = 0;
      plan.dock[i] = 0;
      plan.nogo[i] = 0;
      break;
    case "mark":
      plan.blocked[i] = 0;
      plan.mark[i] = brush.mark;
      break;
    case "dock":
      plan.blocked[i] = 0;
      plan.dock[i] = 1;
      break;
    case "nogo":
      plan.blocked[i] = 0;
      plan.nogo[i] = 1;
      break;
  }
  return before[0] !== plan.blocked[i] || before[1] !== plan.mark[i] || before[2] !== plan.dock[i] || before[3] !== plan.nogo[i];
}

/** The plan with `brush` on every tile of `tiles` inside it (tiles outside are ignored). */
export function paintTiles(plan: Floorplan, tiles: Iterable<Tile>, brush: Brush): Floorplan {
  let out: Floorplan | null = null;
  for (const { row, col } of tiles) {
    if (row < 0 || row >= plan.rows || col < 0 || col >= plan.cols) continue;
    const i = row * plan.cols + col;
    const target: Floorplan = out ?? clonePlan(plan);
    if (paintIndex(target, i, brush)) out = target;
  }
  return out ?? plan;
}

/** Tiles on the straight line from a to b, both included (Bresenham), so a fast drag leaves no gaps. */
export function strokeTiles(a: Tile, b: Tile): Tile[] {
  const tiles: Tile[] = [];
  const dRow = Math.abs(b.row - a.row);
  const dCol = Math.abs(b.col - a.col);
  const stepRow = a.row < b.row ? 1 : -1;
  const stepCol = a.col < b.col ? 1 : -1;
  let err = dCol - dRow;
  let { row, col } = a;
  for (;;) {
    tiles.push({ row, col });
    if (row === b.row && col === b.col) return tiles;
    const twice = 2 * err;
    if (twice > -dRow) {
      err -= dRow;
      col += stepCol;
    }
    if (twice < dCol) {
      err += dCol;
      row += stepRow;
    }
  }
}

/** The rectangle with corners a and b (any two opposite corners), clipped to the plan. */
export function rectBounds(plan: Pick<Floorplan, "rows" | "cols">, a: Tile, b: Tile): { top: number; left: number; bottom: number; right: number } {
  return {
    top: Math.max(0, Math.min(a.row, b.row)),
    left: Math.max(0, Math.min(a.col, b.col)),
    bottom: Math.min(plan.rows - 1, Math.max(a.row, b.row)),
    right: Math.min(plan.cols - 1, Math.max(a.col, b.col)),
  };
}

/** The plan with `brush` on every tile of the rectangle between corners a and b. */
export function fillRect(plan: Floorplan, a: Tile, b: Tile, brush: Brush): Floorplan {
  const { top, left, bottom, right } = rectBounds(plan, a, b);
  function* tiles() {
    for (let row = top; row <= bottom; row++) for (let col = left; col <= right; col++) yield { row, col };
  }
  return paintTiles(plan, tiles(), brush);
}

/** The plan cut or grown to rows × cols, keeping the top-left corner; new tiles are free. */
export function resizePlan(plan: Floorplan, rows: number, cols: number): Floorplan {
  if (!Number.isInteger(rows) || !Number.isInteger(cols) || rows < 1 || cols < 1) throw new RangeError(`a plan needs at least one row and one column, got ${rows} × ${cols}`);
  if (rows === plan.rows && cols === plan.cols) return plan;
  const n = rows * cols;
  const out: Floorplan = { rows, cols, tileM: plan.tileM, blocked: new Uint8Array(n), mark: new Uint8Array(n), dock: new Uint8Array(n), nogo: new Uint8Array(n) };
  const keepRows = Math.min(rows, plan.rows);
  const keepCols = Math.min(cols, plan.cols);
  for (const layer of ["blocked", "mark", "dock", "nogo"] as const) {
    for (let r = 0; r < keepRows; r++) out[layer].set(plan[layer].subarray(r * plan.cols, r * plan.cols + keepCols), r * cols);
  }
  return out;
}
