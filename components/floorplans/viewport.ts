/**
 * Zoom and pan of the editor canvas: a tile is `scale` CSS pixels wide and tile (0, 0)'s
 * corner sits at (offsetX, offsetY) in the canvas. Pointer positions map to tiles and
 * zooming keeps the tile under the pointer in place.
 */
import type { Tile } from "@/lib/floorplan/types";

export interface Viewport {
  scale: number;
  offsetX: number;
  offsetY: number;
}

export const MIN_SCALE = 2;
export const MAX_SCALE = 64;

/** The view that fits rows × cols inside width × height CSS pixels, centred. */
export function fitViewport(rows: number, cols: number, width: number, height: number): Viewport {
  const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, Math.floor(Math.min(width / cols, height / rows) * 100) / 100));
  return { scale, offsetX: (width - cols * scale) / 2, offsetY: (height - rows * scale) / 2 };
}

/** The tile under canvas point (x, y), or null outside the plan. */
export function tileAtPoint(view: Viewport, x: number, y: number, rows: number, cols: number): Tile | null {
  const col = Math.floor((x - view.offsetX) / view.scale);
  const row = Math.floor((y - view.offsetY) / view.scale);
  return row >= 0 && row < rows && col >= 0 && col < cols ? { row, col } : null;
}

/** Like tileAtPoint, clamped to the plan: a drag that leaves the plan keeps painting its edge. */
export function clampedTileAtPoint(view: Viewport, x: number, y: number, rows: number, cols: number): Tile {
  const col = Math.floor((x - view.offsetX) / view.scale);
  const row = Math.floor((y - view.offsetY) / view.scale);
  return { row: Math.min(rows - 1, Math.max(0, row)), col: Math.min(cols - 1, Math.max(0, col)) };
}

/** Zoom by `factor` about canvas point (x, y), within MIN_SCALE..MAX_SCALE. */
export function zoomAt(view: Viewport, factor: number, x: number, y: number): Viewport {
  const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, view.scale * factor));
  const k = scale / view.scale;
  return { scale, offsetX: x - (x - view.offsetX) * k, offsetY: y - (y - view.offsetY) * k };
}

export function panBy(view: Viewport, dx: number, dy: number): Viewport {
  return { ...view, offsetX: view.offsetX + dx, offsetY: view.offsetY + dy };
}
