/**
 * A floorplan: rows × cols square tiles, row 0 at the top, col 0 at the left.
 * Each layer is a row-major Uint8Array of length rows*cols.
 */
export interface Floorplan {
  rows: number;
  cols: number;
  /** Tile side in metres (commonly one foot, 0.3048 m). */
  tileM: number;
  /** 1 where the tile is blocked, 0 where free. The outside of the plan counts as blocked. */
  blocked: Uint8Array;
  /** Floor mark class per tile; 0 = plain floor. */
  mark: Uint8Array;
  /** 1 where the tile is a dock. */
  dock: Uint8Array;
  /** 1 where robots must not be sent (still traversable by the filter, never a goal). */
  nogo: Uint8Array;
}

export interface Tile {
  row: number;
  col: number;
}

/** Index of (row, col, heading) in a belief or policy array: ((row * cols) + col) * 4 + heading. */
export function stateIndex(plan: Pick<Floorplan, "cols">, row: number, col: number, heading: number): number {
  return (row * plan.cols + col) * 4 + heading;
}

/** Number of (tile, heading) states of a plan. */
export function stateCount(plan: Pick<Floorplan, "rows" | "cols">): number {
  return plan.rows * plan.cols * 4;
}

/** True when (row, col) lies inside the plan and is not blocked. */
export function isFreeTile(plan: Floorplan, row: number, col: number): boolean {
  return row >= 0 && row < plan.rows && col >= 0 && col < plan.cols && plan.blocked[row * plan.cols + col] === 0;
}
