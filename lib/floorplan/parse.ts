/**
 * Reads Tessera floorplans from text grids, PGM and PNG images, and writes the
 * text form back.
 *
 * Text format (UTF-8; `#` starts a comment line):
 *
 *     # tiles: 0 free, 1 blocked
 *     0 0 0 1
 *     0,1,0,0
 *     0000
 *     ---
 *     . 2 . .
 *     D . 5X .
 *     . . . X
 *
 * - The first grid gives the tiles, one line per row. Cells are separated by
 *   commas, by whitespace, or not at all (then every character is a cell);
 *   each line picks its own style. A trailing comma is allowed.
 * - First-grid cells are one character: `0` free, `1` blocked, and as a
 *   shorthand for a free tile with an annotation, `2`–`9` (floor mark class),
 *   `D` (dock) or `X` (no-go).
 * - An optional second grid, after a blank line or a line of three or more
 *   dashes, annotates the same rows × cols tiles: `.` or `0` nothing, else a
 *   mark class 1–255 (no leading zero) and/or the letters `D` and `X`, e.g.
 *   `3`, `D`, `4DX`. Annotations on blocked tiles are rejected. With no
 *   separators each character is a cell, so only one symbol per tile.
 * - Letters are case-insensitive. Anything else is an unknown symbol.
 *
 * Images (PNG via pngjs, PGM P5 binary or P2 ASCII): each pixelsPerTile ×
 * pixelsPerTile block is one tile; the block's mean grey (0..255, alpha
 * composited over white, RGB weighted 0.299/0.587/0.114 as in ITU-R BT.601)
 * below `threshold` makes the tile blocked (dark = blocked). Image sides must
 * be multiples of pixelsPerTile. Images carry no marks, docks or no-go tiles.
 *
 * Text that starts with `{` is read as the JSON form (see json.ts).
 * Every reader throws FloorplanParseError with the line/row/col (text), byte
 * (PGM) or part (PNG) where the input fails; tryParseFloorplan returns the
 * failure as a value instead. Plans over 512 × 512 tiles or of zero size are
 * rejected, image sizes before decoding the pixels.
 */
import { PNG } from "pngjs";
import { floorplanFromJson } from "./json";
import type { FloorplanWhere } from "./plan";
import { checkFloorplanSize, DEFAULT_TILE_M, emptyFloorplan, FloorplanParseError } from "./plan";
import type { Floorplan } from "./types";

/** Decoded RGBA pixels, 4 bytes per pixel, row-major. */
export interface RgbaImage {
  width: number;
  height: number;
  data: Uint8Array;
}

export interface ParseFloorplanOptions {
  /** Grey level 0..255 below which a tile is blocked (default 128). */
  threshold?: number;
  /** Image pixels per tile side, a positive integer (default 1). */
  pixelsPerTile?: number;
  /** Tile side in metres (default 0.3048, one foot); the JSON form's own tileM wins. */
  tileM?: number;
  /** Largest image accepted, in pixels (default IMAGE_MAX_PIXELS); checked on the header, before any pixel is decoded. */
  maxImagePixels?: number;
  /** PNG decoder; defaults to pngjs's PNG.sync.read. Throw on bytes that do not decode. */
  decodePng?: (bytes: Uint8Array) => RgbaImage;
}

export type FloorplanParseResult = { ok: true; plan: Floorplan } | { ok: false; error: { reason: string; where: FloorplanWhere } };

/** Default image size limit: 4096 × 4096 pixels, 64 MB once decoded to RGBA. */
export const IMAGE_MAX_PIXELS = 4096 * 4096;

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** Reads a floorplan from text/CSV, JSON text, PNG or PGM bytes (format in the module header); throws FloorplanParseError saying where the input fails. */
export function parseFloorplan(input: string | Uint8Array, opts: ParseFloorplanOptions = {}): Floorplan {
  const tileM = opts.tileM ?? DEFAULT_TILE_M;
  if (!(tileM > 0) || !Number.isFinite(tileM)) throw new RangeError(`tileM must be a positive number of metres, got ${tileM}`);
  if (typeof input === "string") return parseTextOrJson(input, opts, tileM);
  if (isPng(input)) return parsePng(input, opts, tileM);
  if (input.length >= 2 && input[0] === 0x50 && (input[1] === 0x35 || input[1] === 0x32)) return parsePgm(input, opts, tileM);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(input);
  } catch {
    throw new FloorplanParseError("bytes are neither PNG, PGM nor UTF-8 text", { byte: 0 });
  }
  return parseTextOrJson(text, opts, tileM);
}

/** Like parseFloorplan, with the failure returned as { ok: false, error: { reason, where } } for the app. */
export function tryParseFloorplan(input: string | Uint8Array, opts: ParseFloorplanOptions = {}): FloorplanParseResult {
  try {
    return { ok: true, plan: parseFloorplan(input, opts) };
  } catch (err) {
    if (err instanceof FloorplanParseError) return { ok: false, error: { reason: err.reason, where: err.where } };
    throw err;
  }
}

function parseTextOrJson(raw: string, opts: ParseFloorplanOptions, tileM: number): Floorplan {
  const text = raw.charCodeAt(0) === 0xfeff ? raw.slice(1) : raw;
  if (text.trimStart().startsWith("{")) {
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (err) {
      throw new FloorplanParseError(`not valid JSON: ${(err as Error).message}`, { field: "(document)" });
    }
    return floorplanFromJson(json, { tileM });
  }
  if (text.startsWith("P2")) return parsePgm(new TextEncoder().encode(text), opts, tileM);
  return parseTextGrid(text, tileM);
}

interface GridLine {
  line: number;
  cells: string[];
}

function splitCells(raw: string, line: number): string[] {
  const trimmed = raw.trim();
  if (trimmed.includes(",")) {
    const cells = trimmed.split(",").map((c) => c.trim());
    if (cells.length > 1 && cells[cells.length - 1] === "") cells.pop();
    const empty = cells.indexOf("");
    if (empty >= 0) throw new FloorplanParseError("empty cell", { line, col: empty });
    return cells;
  }
  if (/\s/.test(trimmed)) return trimmed.split(/\s+/);
  return Array.from(trimmed);
}

interface Annotation {
  mark: number;
  dock: boolean;
  nogo: boolean;
}

function parseAnnotation(cell: string, grid: string, where: FloorplanWhere): Annotation {
  const match = /^([1-9][0-9]*)?([DdXx]*)$/.exec(cell);
  const letters = match ? match[2].toUpperCase() : "";
  if (!match || (match[1] === undefined && letters === "") || /(.).*\1/.test(letters)) {
    throw new FloorplanParseError(`unknown symbol "${cell}" in the ${grid} grid`, where);
  }
  const mark = match[1] === undefined ? 0 : Number(match[1]);
  if (mark > 255) throw new FloorplanParseError(`mark class ${mark} is over 255`, where);
  return { mark, dock: letters.includes("D"), nogo: letters.includes("X") };
}

function parseTextGrid(text: string, tileM: number): Floorplan {
  const grids: GridLine[][] = [];
  let current: GridLine[] | null = null;
  const lines = text.split(/\r\n|\r|\n/);
  for (let i = 0; i < lines.length; i++) {
    const trimmed = lines[i].trim();
    if (trimmed.startsWith("#")) continue;
    if (trimmed === "" || /^-{3,}$/.test(trimmed)) {
      current = null;
      continue;
    }
    if (current === null) {
      current = [];
      grids.push(current);
    }
    current.push({ line: i + 1, cells: splitCells(lines[i], i + 1) });
  }
  if (grids.length === 0) throw new FloorplanParseError("plan has zero size (no grid rows)", { line: 1 });
  if (grids.length > 2) throw new FloorplanParseError("more than two grids (tiles, then annotations)", { line: grids[2][0].line });
  const tiles = grids[0];
  const rows = tiles.length;
  const cols = tiles[0].cells.length;
  checkFloorplanSize(rows, cols, { line: tiles[0].line });
  const plan = emptyFloorplan(rows, cols, tileM);
  for (let r = 0; r < rows; r++) {
    const { line, cells } = tiles[r];
    if (cells.length !== cols) {
      throw new FloorplanParseError(`ragged row: ${cells.length} cells where row 0 has ${cols}`, { line, row: r, col: Math.min(cells.length, cols) });
    }
    for (let c = 0; c < cols; c++) {
      const cell = cells[c];
      const where = { line, row: r, col: c };
      if (cell.length !== 1) throw new FloorplanParseError(`unknown symbol "${cell}" in the tile grid (one character per tile)`, where);
      if (cell === "1") plan.blocked[r * cols + c] = 1;
      else if (cell !== "0") applyAnnotation(plan, r, c, parseAnnotation(cell, "tile", where), where);
    }
  }
  if (grids.length === 2) {
    const notes = grids[1];
    if (notes.length !== rows) {
      throw new FloorplanParseError(`annotation grid has ${notes.length} rows where the tile grid has ${rows}`, { line: notes[Math.min(notes.length, rows) - 1].line });
    }
    for (let r = 0; r < rows; r++) {
      const { line, cells } = notes[r];
      if (cells.length !== cols) {
        throw new FloorplanParseError(`ragged annotation row: ${cells.length} cells where the tile grid has ${cols}`, { line, row: r, col: Math.min(cells.length, cols) });
      }
      for (let c = 0; c < cols; c++) {
        const cell = cells[c];
        if (cell === "." || cell === "0") continue;
        const where = { line, row: r, col: c };
        applyAnnotation(plan, r, c, parseAnnotation(cell, "annotation", where), where);
      }
    }
  }
  return plan;
}

function applyAnnotation(plan: Floorplan, row: number, col: number, note: Annotation, where: FloorplanWhere): void {
  const i = row * plan.cols + col;
  if (plan.blocked[i] !== 0) throw new FloorplanParseError("mark, dock or no-go on a blocked tile", where);
  if (note.mark !== 0) plan.mark[i] = note.mark;
  if (note.dock) plan.dock[i] = 1;
  if (note.nogo) plan.nogo[i] = 1;
}

/** The text form (comma-separated tile grid, then `---` and the annotation grid when there is any); parseFloorplan reads it back unchanged except tileM. */
export function floorplanToCsv(plan: Floorplan): string {
  const { rows, cols } = plan;
  const out: string[] = [];
  let annotated = false;
  for (let r = 0; r < rows; r++) {
    const cells: string[] = [];
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c;
      cells.push(plan.blocked[i] !== 0 ? "1" : "0");
      if (plan.mark[i] !== 0 || plan.dock[i] !== 0 || plan.nogo[i] !== 0) annotated = true;
    }
    out.push(cells.join(","));
  }
  if (annotated) {
    out.push("---");
    for (let r = 0; r < rows; r++) {
      const cells: string[] = [];
      for (let c = 0; c < cols; c++) {
        const i = r * cols + c;
        const note = (plan.mark[i] !== 0 ? String(plan.mark[i]) : "") + (plan.dock[i] !== 0 ? "D" : "") + (plan.nogo[i] !== 0 ? "X" : "");
        cells.push(note === "" ? "." : note);
      }
      out.push(cells.join(","));
    }
  }
  return out.join("\n") + "\n";
}

function isPng(bytes: Uint8Array): boolean {
  if (bytes.length < PNG_SIGNATURE.length) return false;
  return PNG_SIGNATURE.every((b, i) => bytes[i] === b);
}

function imageTiles(width: number, height: number, opts: ParseFloorplanOptions, where: FloorplanWhere): { rows: number; cols: number; ppt: number } {
  const ppt = opts.pixelsPerTile ?? 1;
  if (!Number.isInteger(ppt) || ppt < 1) throw new RangeError(`pixelsPerTile must be a positive integer, got ${ppt}`);
  if (width < 1 || height < 1) throw new FloorplanParseError(`image has zero size (${width} × ${height} px)`, where);
  const maxPixels = opts.maxImagePixels ?? IMAGE_MAX_PIXELS;
  if (width * height > maxPixels) {
    throw new FloorplanParseError(`image of ${width} × ${height} px is over the ${maxPixels.toLocaleString("en-US")}-pixel limit`, where);
  }
  if (width % ppt !== 0 || height % ppt !== 0) {
    throw new FloorplanParseError(`image of ${width} × ${height} px is not a whole number of ${ppt}-pixel tiles`, where);
  }
  const rows = height / ppt;
  const cols = width / ppt;
  checkFloorplanSize(rows, cols, where);
  return { rows, cols, ppt };
}

function planFromGrey(grey: Float32Array, width: number, rows: number, cols: number, ppt: number, opts: ParseFloorplanOptions, tileM: number): Floorplan {
  const threshold = opts.threshold ?? 128;
  if (!(threshold >= 0 && threshold <= 255)) throw new RangeError(`threshold must be within 0..255, got ${threshold}`);
  const plan = emptyFloorplan(rows, cols, tileM);
  const area = ppt * ppt;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      let sum = 0;
      for (let y = r * ppt; y < (r + 1) * ppt; y++) {
        const rowStart = y * width;
        for (let x = c * ppt; x < (c + 1) * ppt; x++) sum += grey[rowStart + x];
      }
      if (sum / area < threshold) plan.blocked[r * cols + c] = 1;
    }
  }
  return plan;
}

function decodeWithPngjs(bytes: Uint8Array): RgbaImage {
  const png = PNG.sync.read(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  return { width: png.width, height: png.height, data: png.data };
}

function parsePng(bytes: Uint8Array, opts: ParseFloorplanOptions, tileM: number): Floorplan {
  if (bytes.length < 24) throw new FloorplanParseError("PNG is truncated before its header", { field: "PNG IHDR", byte: bytes.length });
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerWidth = view.getUint32(16);
  const headerHeight = view.getUint32(20);
  imageTiles(headerWidth, headerHeight, opts, { field: "PNG IHDR", byte: 16 });
  let image: RgbaImage;
  try {
    image = (opts.decodePng ?? decodeWithPngjs)(bytes);
  } catch (err) {
    throw new FloorplanParseError(`image does not decode: ${(err as Error).message}`, { field: "PNG data" });
  }
  const { rows, cols, ppt } = imageTiles(image.width, image.height, opts, { field: "PNG IHDR", byte: 16 });
  const pixels = image.width * image.height;
  if (image.data.length < pixels * 4) throw new FloorplanParseError("decoded PNG has fewer pixels than its size says", { field: "PNG data" });
  const grey = new Float32Array(pixels);
  for (let p = 0; p < pixels; p++) {
    const d = p * 4;
    const alpha = image.data[d + 3] / 255;
    const lum = 0.299 * image.data[d] + 0.587 * image.data[d + 1] + 0.114 * image.data[d + 2];
    grey[p] = lum * alpha + 255 * (1 - alpha);
  }
  return planFromGrey(grey, image.width, rows, cols, ppt, opts, tileM);
}

function parsePgm(bytes: Uint8Array, opts: ParseFloorplanOptions, tileM: number): Floorplan {
  let pos = 0;
  const isSpace = (b: number) => b === 0x20 || b === 0x09 || b === 0x0a || b === 0x0d || b === 0x0b || b === 0x0c;
  const token = (what: string): { text: string; at: number } => {
    for (;;) {
      while (pos < bytes.length && isSpace(bytes[pos])) pos++;
      if (pos < bytes.length && bytes[pos] === 0x23) {
        while (pos < bytes.length && bytes[pos] !== 0x0a && bytes[pos] !== 0x0d) pos++;
        continue;
      }
      break;
    }
    const at = pos;
    while (pos < bytes.length && !isSpace(bytes[pos]) && bytes[pos] !== 0x23) pos++;
    if (at === pos) throw new FloorplanParseError(`PGM ends before its ${what}`, { byte: at });
    return { text: String.fromCharCode(...bytes.subarray(at, pos)), at };
  };
  const integer = (what: string, min: number, max: number): number => {
    const { text, at } = token(what);
    const value = /^[0-9]+$/.test(text) ? Number(text) : NaN;
    if (!(value >= min && value <= max)) throw new FloorplanParseError(`PGM ${what} "${text}" is not an integer in ${min}..${max}`, { byte: at });
    return value;
  };
  const magic = token("magic number").text;
  if (magic !== "P5" && magic !== "P2") throw new FloorplanParseError(`unknown PGM magic number "${magic}"`, { byte: 0 });
  const width = integer("width", 0, 1 << 24);
  const height = integer("height", 0, 1 << 24);
  const { rows, cols, ppt } = imageTiles(width, height, opts, { byte: 0 });
  const maxval = integer("maxval", 1, 65535);
  const pixels = width * height;
  const grey = new Float32Array(pixels);
  const scale = 255 / maxval;
  if (magic === "P5") {
    const dataStart = pos + 1;
    const wide = maxval > 255;
    const needed = pixels * (wide ? 2 : 1);
    if (bytes.length - dataStart < needed) {
      throw new FloorplanParseError(`PGM pixel data is truncated: ${Math.max(0, bytes.length - dataStart)} of ${needed} bytes`, { byte: bytes.length });
    }
    for (let p = 0; p < pixels; p++) {
      const value = wide ? (bytes[dataStart + 2 * p] << 8) | bytes[dataStart + 2 * p + 1] : bytes[dataStart + p];
      if (value > maxval) throw new FloorplanParseError(`PGM pixel ${value} is over maxval ${maxval}`, { byte: dataStart + p * (wide ? 2 : 1) });
      grey[p] = value * scale;
    }
  } else {
    for (let p = 0; p < pixels; p++) grey[p] = integer(`pixel ${p}`, 0, maxval) * scale;
  }
  return planFromGrey(grey, width, rows, cols, ppt, opts, tileM);
}
