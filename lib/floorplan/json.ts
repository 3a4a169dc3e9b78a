/**
 * The app's JSON form of a Tessera floorplan (stored in the database, sent to
 * dashboards, exported), and its strict reader.
 *
 *     { "rows": 2, "cols": 3, "tileM": 0.3048,
 *       "blocked": ["001", "100"],            // or a flat 0/1 number[] of rows*cols
 *       "mark": ["020", "000"],               // optional: digit rows, or a flat number[] 0..255
 *       "dock": [{ "row": 0, "col": 0 }],     // optional tile lists
 *       "nogo": [{ "row": 1, "col": 2 }] }
 *
 * Assumes nothing beyond the JSON value itself: every field is checked, and a
 * failure names the field and the row/col. Marks, docks and no-go tiles on
 * blocked tiles are rejected, as in the text form.
 */
import type { FloorplanWhere } from "./plan";
import { checkFloorplanSize, DEFAULT_TILE_M, emptyFloorplan, FloorplanParseError } from "./plan";
import type { Floorplan, Tile } from "./types";

export interface FloorplanJson {
  rows: number;
  cols: number;
  /** Tile side in metres. */
  tileM: number;
  /** One string of `0`/`1` per row, or a flat row-major array of 0/1. */
  blocked: string[] | number[];
  /** One string of digits per row (classes 0–9), or a flat row-major array of classes 0..255. */
  mark?: string[] | number[];
  dock?: Tile[];
  nogo?: Tile[];
}

type Layer = "blocked" | "mark";

function readLayer(value: unknown, layer: Layer, rows: number, cols: number, out: Uint8Array): void {
  const maxValue = layer === "blocked" ? 1 : 255;
  if (!Array.isArray(value)) throw new FloorplanParseError(`${layer} must be an array`, { field: layer });
  if (value.length === rows && value.every((v) => typeof v === "string")) {
    for (let r = 0; r < rows; r++) {
      const line = value[r] as string;
      if (line.length !== cols) throw new FloorplanParseError(`ragged row: ${line.length} cells where cols is ${cols}`, { field: `${layer}[${r}]`, row: r, col: Math.min(line.length, cols) });
      for (let c = 0; c < cols; c++) {
        const digit = line.charCodeAt(c) - 48;
        if (!(digit >= 0 && digit <= Math.min(9, maxValue))) {
          throw new FloorplanParseError(`unknown symbol "${line[c]}"`, { field: `${layer}[${r}]`, row: r, col: c });
        }
        out[r * cols + c] = digit;
      }
    }
    return;
  }
  if (value.length !== rows * cols) {
    throw new FloorplanParseError(`${layer} has ${value.length} entries; expected ${rows} row strings or ${rows * cols} numbers`, { field: layer });
  }
  for (let i = 0; i < value.length; i++) {
    const v: unknown = value[i];
    if (typeof v !== "number" || !Number.isInteger(v) || v < 0 || v > maxValue) {
      throw new FloorplanParseError(`${layer} entry must be an integer 0..${maxValue}`, { field: `${layer}[${i}]`, row: Math.floor(i / cols), col: i % cols });
    }
    out[i] = v;
  }
}

function readTiles(value: unknown, field: "dock" | "nogo", plan: Floorplan): void {
  if (value === undefined) return;
  if (!Array.isArray(value)) throw new FloorplanParseError(`${field} must be an array of { row, col }`, { field });
  value.forEach((tile: unknown, k) => {
    const where: FloorplanWhere = { field: `${field}[${k}]` };
    const t = tile as Partial<Tile> | null;
    if (typeof t !== "object" || t === null || !Number.isInteger(t.row) || !Number.isInteger(t.col)) {
      throw new FloorplanParseError("tile must be { row, col } with integer row and col", where);
    }
    const row = t.row as number;
    const col = t.col as number;
    if (row < 0 || row >= plan.rows || col < 0 || col >= plan.cols) throw new FloorplanParseError("tile lies outside the plan", { ...where, row, col });
    if (plan.blocked[row * plan.cols + col] !== 0) throw new FloorplanParseError(`${field} on a blocked tile`, { ...where, row, col });
    plan[field][row * plan.cols + col] = 1;
  });
}

/** Reads the JSON form (a parsed value, not text); throws FloorplanParseError naming the field and row/col. opts.tileM is used when the value has none. */
export function floorplanFromJson(json: unknown, opts: { tileM?: number } = {}): Floorplan {
  if (typeof json !== "object" || json === null || Array.isArray(json)) throw new FloorplanParseError("floorplan JSON must be an object", { field: "(document)" });
  const value = json as Record<string, unknown>;
  const { rows, cols } = value;
  if (typeof rows !== "number" || typeof cols !== "number") throw new FloorplanParseError("rows and cols must be numbers", { field: typeof rows !== "number" ? "rows" : "cols" });
  checkFloorplanSize(rows, cols, { field: "rows" });
  const tileM = value.tileM ?? opts.tileM ?? DEFAULT_TILE_M;
  if (typeof tileM !== "number" || !(tileM > 0) || !Number.isFinite(tileM)) throw new FloorplanParseError("tileM must be a positive number of metres", { field: "tileM" });
  const plan = emptyFloorplan(rows, cols, tileM);
  readLayer(value.blocked, "blocked", rows, cols, plan.blocked);
  if (value.mark !== undefined) {
    readLayer(value.mark, "mark", rows, cols, plan.mark);
    for (let i = 0; i < plan.mark.length; i++) {
      if (plan.mark[i] !== 0 && plan.blocked[i] !== 0) throw new FloorplanParseError("mark on a blocked tile", { field: "mark", row: Math.floor(i / cols), col: i % cols });
    }
  }
  readTiles(value.dock, "dock", plan);
  readTiles(value.nogo, "nogo", plan);
  return plan;
}

/** Like floorplanFromJson, with the failure returned as a value. */
export function tryFloorplanFromJson(json: unknown, opts: { tileM?: number } = {}): { ok: true; plan: Floorplan } | { ok: false; error: { reason: string; where: FloorplanWhere } } {
  try {
    return { ok: true, plan: floorplanFromJson(json, opts) };
  } catch (err) {
    if (err instanceof FloorplanParseError) return { ok: false, error: { reason: err.reason, where: err.where } };
    throw err;
  }
}

function tilesWhere(layer: Uint8Array, cols: number): Tile[] {
  const tiles: Tile[] = [];
  for (let i = 0; i < layer.length; i++) if (layer[i] !== 0) tiles.push({ row: Math.floor(i / cols), col: i % cols });
  return tiles;
}

/** The JSON form: blocked as row strings, mark as digit rows (or a flat array when a class is over 9; omitted when all 0), dock and nogo as tile lists. */
export function floorplanToJson(plan: Floorplan): FloorplanJson {
  const { rows, cols } = plan;
  const rowStrings = (layer: Uint8Array): string[] => {
    const out: string[] = [];
    for (let r = 0; r < rows; r++) out.push(Array.from(layer.subarray(r * cols, (r + 1) * cols), (v) => String(v)).join(""));
    return out;
  };
  const json: FloorplanJson = { rows, cols, tileM: plan.tileM, blocked: rowStrings(plan.blocked), dock: tilesWhere(plan.dock, cols), nogo: tilesWhere(plan.nogo, cols) };
  let maxMark = 0;
  for (let i = 0; i < plan.mark.length; i++) maxMark = Math.max(maxMark, plan.mark[i]);
  if (maxMark > 9) json.mark = Array.from(plan.mark);
  else if (maxMark > 0) json.mark = rowStrings(plan.mark);
  return json;
}
