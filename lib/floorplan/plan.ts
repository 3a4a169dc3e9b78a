/**
 * Small constructors and counts for Tessera floorplans, and the parse error
 * shared by every floorplan reader.
 *
 * Assumes the layers are row-major Uint8Arrays of length rows*cols. The size
 * limit (512 × 512 tiles) keeps one robot's belief (1 M states, 8 MB) and its
 * precomputed tables within what one server process can hold for a fleet.
 */
import type { Floorplan } from "./types";

/** Largest accepted plan side, in tiles. */
export const FLOORPLAN_MAX_SIDE = 512;
/** One foot in metres: the default tile side (common practice for indoor robot courses). */
export const DEFAULT_TILE_M = 0.3048;

/** Where in the input a floorplan was rejected: 1-based text line, 0-based tile row and col, byte offset, or the JSON field. */
export interface FloorplanWhere {
  line?: number;
  row?: number;
  col?: number;
  byte?: number;
  field?: string;
}

/** A floorplan input that cannot be read; `where` locates the fault and `reason` says what it is. */
export class FloorplanParseError extends Error {
  readonly where: FloorplanWhere;
  readonly reason: string;
  constructor(reason: string, where: FloorplanWhere = {}) {
    super(`${reason}${describeWhere(where)}`);
    this.name = "FloorplanParseError";
    this.reason = reason;
    this.where = where;
  }
}

/** " at line 3, row 2, col 5" style suffix for a location (empty when nothing is known). */
export function describeWhere(where: FloorplanWhere): string {
  const parts: string[] = [];
  if (where.field !== undefined) parts.push(`field ${where.field}`);
  if (where.line !== undefined) parts.push(`line ${where.line}`);
  if (where.row !== undefined) parts.push(`row ${where.row}`);
  if (where.col !== undefined) parts.push(`col ${where.col}`);
  if (where.byte !== undefined) parts.push(`byte ${where.byte}`);
  return parts.length ? ` at ${parts.join(", ")}` : "";
}

/** Throws FloorplanParseError unless rows × cols is a legal plan size (1..512 each). */
export function checkFloorplanSize(rows: number, cols: number, where: FloorplanWhere = {}): void {
  if (!Number.isInteger(rows) || !Number.isInteger(cols) || rows < 1 || cols < 1) {
    throw new FloorplanParseError(`plan has zero size (${rows} × ${cols} tiles)`, where);
  }
  if (rows > FLOORPLAN_MAX_SIDE || cols > FLOORPLAN_MAX_SIDE) {
    throw new FloorplanParseError(`plan is ${rows} × ${cols} tiles, over the ${FLOORPLAN_MAX_SIDE} × ${FLOORPLAN_MAX_SIDE} limit`, where);
  }
}

/** An all-free plan of rows × cols tiles of side tileM metres (default one foot); throws RangeError on an illegal size. */
export function emptyFloorplan(rows: number, cols: number, tileM: number = DEFAULT_TILE_M): Floorplan {
  if (!Number.isInteger(rows) || !Number.isInteger(cols) || rows < 1 || cols < 1 || rows > FLOORPLAN_MAX_SIDE || cols > FLOORPLAN_MAX_SIDE) {
    throw new RangeError(`illegal plan size ${rows} × ${cols}`);
  }
  if (!(tileM > 0) || !Number.isFinite(tileM)) throw new RangeError(`tileM must be a positive number of metres, got ${tileM}`);
  const n = rows * cols;
  return { rows, cols, tileM, blocked: new Uint8Array(n), mark: new Uint8Array(n), dock: new Uint8Array(n), nogo: new Uint8Array(n) };
}

/** Number of free (unblocked) tiles. */
export function freeTileCount(plan: Floorplan): number {
  let free = 0;
  for (let i = 0; i < plan.blocked.length; i++) if (plan.blocked[i] === 0) free++;
  return free;
}
