import { PNG } from "pngjs";
import { describe, expect, it } from "vitest";
import { floorplanFromJson, floorplanToJson, tryFloorplanFromJson } from "./json";
import { floorplanToCsv, parseFloorplan, tryParseFloorplan } from "./parse";
import { emptyFloorplan, FloorplanParseError, freeTileCount } from "./plan";

function failure(input: string | Uint8Array, opts = {}) {
  const result = tryParseFloorplan(input, opts);
  if (result.ok) throw new Error("expected a failure");
  return result.error;
}

describe("parseFloorplan, text", () => {
  it("reads comma, whitespace and unseparated rows, with comments and CRLF", () => {
    const plan = parseFloorplan("# warehouse aisle\r\n0,0,1,0,\r\n1 0 0 0\r\n0001\r\n", { tileM: 0.5 });
    expect(plan.rows).toBe(3);
    expect(plan.cols).toBe(4);
    expect(plan.tileM).toBe(0.5);
    expect(Array.from(plan.blocked)).toEqual([0, 0, 1, 0, 1, 0, 0, 0, 0, 0, 0, 1]);
    expect(freeTileCount(plan)).toBe(9);
  });
  it("reads marks, docks and no-go tiles from the annotation grid and the tile-grid shorthand", () => {
    const plan = parseFloorplan("0 0 0\n0 1 7\n\n. 12D .\nX . .\n");
    expect(Array.from(plan.mark)).toEqual([0, 12, 0, 0, 0, 7]);
    expect(Array.from(plan.dock)).toEqual([0, 1, 0, 0, 0, 0]);
    expect(Array.from(plan.nogo)).toEqual([0, 0, 0, 1, 0, 0]);
    const shorthand = parseFloorplan("0D1\nx30\n");
    expect(Array.from(shorthand.dock)).toEqual([0, 1, 0, 0, 0, 0]);
    expect(Array.from(shorthand.nogo)).toEqual([0, 0, 0, 1, 0, 0]);
    expect(Array.from(shorthand.mark)).toEqual([0, 0, 0, 0, 3, 0]);
  });
  it("round-trips through floorplanToCsv and the JSON form", () => {
    const plan = parseFloorplan("0 0 1 0\n0 0 0 0\n---\n4 . . D\n. 200X X .\n", { tileM: 0.25 });
    const again = parseFloorplan(floorplanToCsv(plan), { tileM: 0.25 });
    expect(again).toEqual(plan);
    const json = floorplanToJson(plan);
    expect(json.blocked).toEqual(["0010", "0000"]);
    expect(floorplanFromJson(JSON.parse(JSON.stringify(json)))).toEqual(plan);
    expect(parseFloorplan(JSON.stringify(json))).toEqual(plan);
  });
  it("says where a ragged row, an unknown symbol or a bad annotation is", () => {
    expect(failure("000\n00\n000\n")).toEqual({ reason: expect.stringContaining("ragged row"), where: { line: 2, row: 1, col: 2 } });
    expect(failure("# plan\n0,0,0\n0,q,0\n")).toEqual({ reason: expect.stringContaining('unknown symbol "q"'), where: { line: 3, row: 1, col: 1 } });
    expect(failure("0 0\n0 1\n---\n. .\n. D\n")).toEqual({ reason: expect.stringContaining("blocked tile"), where: { line: 5, row: 1, col: 1 } });
    expect(failure("0 0\n0 0\n---\n. 05\n. .\n").where).toEqual({ line: 4, row: 0, col: 1 });
    expect(failure("0,,0\n").where).toEqual({ line: 1, col: 1 });
    expect(failure("0 0\n\n. .\n\n1 1\n").where).toEqual({ line: 5 });
    expect(() => parseFloorplan("01\n0\n")).toThrow(FloorplanParseError);
    expect(() => parseFloorplan("01\n0\n")).toThrow(/line 2/);
  });
  it("rejects zero size and plans over 512 × 512", () => {
    expect(failure("# nothing\n\n").reason).toMatch(/zero size/);
    expect(failure(`${"0".repeat(513)}\n`).reason).toMatch(/over the 512 × 512 limit/);
    expect(parseFloorplan(`${"0".repeat(512)}\n`).cols).toBe(512);
  });
});

describe("parseFloorplan, images", () => {
  /** A grey PNG made with pngjs: value per pixel, alpha 255. */
  function pngOf(width: number, height: number, grey: (x: number, y: number) => number, alpha = 255): Uint8Array {
    const png = new PNG({ width, height });
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        const i = (y * width + x) * 4;
        const g = grey(x, y);
        png.data[i] = g;
        png.data[i + 1] = g;
        png.data[i + 2] = g;
        png.data[i + 3] = alpha;
      }
    }
    return new Uint8Array(PNG.sync.write(png));
  }

  it("PNG round trip: a plan drawn as 3-pixel tiles comes back tile for tile", () => {
    const source = parseFloorplan("0 1 0 0 0\n0 1 0 1 0\n0 0 0 1 0\n1 0 0 0 0\n");
    const bytes = pngOf(15, 12, (x, y) => (source.blocked[Math.floor(y / 3) * 5 + Math.floor(x / 3)] ? 20 : 235));
    const plan = parseFloorplan(bytes, { pixelsPerTile: 3, tileM: 0.4 });
    expect(plan.rows).toBe(4);
    expect(plan.cols).toBe(5);
    expect(plan.tileM).toBe(0.4);
    expect(Array.from(plan.blocked)).toEqual(Array.from(source.blocked));
  });
  it("uses the threshold on the mean grey of a tile and composites alpha over white", () => {
    const bytes = pngOf(2, 1, (x) => (x === 0 ? 100 : 150));
    expect(Array.from(parseFloorplan(bytes).blocked)).toEqual([1, 0]);
    expect(Array.from(parseFloorplan(bytes, { threshold: 160 }).blocked)).toEqual([1, 1]);
    expect(Array.from(parseFloorplan(pngOf(2, 1, () => 0, 0)).blocked)).toEqual([0, 0]);
  });
  it("refuses an image whose header announces too many pixels without decoding it", () => {
    const header = pngOf(4, 4, () => 0);
    const view = new DataView(header.buffer, header.byteOffset, header.byteLength);
    view.setUint32(16, 100_000);
    view.setUint32(20, 100_000);
    let decoded = 0;
    const decodePng = () => {
      decoded += 1;
      return { width: 0, height: 0, data: new Uint8Array(0) };
    };
    expect(failure(header, { pixelsPerTile: 200, decodePng })).toEqual({ reason: expect.stringContaining("100000 × 100000 px is over the 16,777,216-pixel limit"), where: { field: "PNG IHDR", byte: 16 } });
    expect(decoded).toBe(0);
    expect(failure(new TextEncoder().encode("P5\n60000 60000\n255\n"), { pixelsPerTile: 120 }).reason).toMatch(/over the 16,777,216-pixel limit/);
    expect(failure(pngOf(6, 6, () => 0), { maxImagePixels: 35 }).reason).toMatch(/6 × 6 px is over the 35-pixel limit/);
  });
  it("rejects a PNG that does not decode, or does not split into whole tiles", () => {
    const bytes = pngOf(4, 4, () => 0);
    const broken = bytes.slice(0, 40);
    expect(failure(broken).reason).toMatch(/does not decode/);
    expect(failure(bytes, { pixelsPerTile: 3 })).toEqual({ reason: expect.stringContaining("whole number of 3-pixel tiles"), where: { field: "PNG IHDR", byte: 16 } });
  });
  it("reads binary P5 and ASCII P2 PGM, with comments and 16-bit samples", () => {
    const header = new TextEncoder().encode("P5\n# scanned floor\n3 2\n255\n");
    const p5 = new Uint8Array([...header, 0, 255, 90, 200, 10, 255]);
    expect(Array.from(parseFloorplan(p5).blocked)).toEqual([1, 0, 1, 0, 1, 0]);
    const wide = new Uint8Array([...new TextEncoder().encode("P5 2 1 65535\n"), 0x10, 0x00, 0xf0, 0x00]);
    expect(Array.from(parseFloorplan(wide).blocked)).toEqual([1, 0]);
    const p2 = "P2\n4 1\n15\n0 15 7 8\n";
    expect(Array.from(parseFloorplan(p2).blocked)).toEqual([1, 0, 1, 0]);
    expect(Array.from(parseFloorplan(new TextEncoder().encode(p2)).blocked)).toEqual([1, 0, 1, 0]);
  });
  it("says where a PGM is truncated or out of range", () => {
    const header = new TextEncoder().encode("P5\n3 2\n255\n");
    expect(failure(new Uint8Array([...header, 1, 2, 3])).reason).toMatch(/truncated: 3 of 6 bytes/);
    expect(failure("P2\n2 1\n15\n3 99\n")).toEqual({ reason: expect.stringContaining('"99"'), where: { byte: 12 } });
    expect(failure("P2\n0 4\n15\n").reason).toMatch(/zero size/);
  });
});

describe("floorplanFromJson", () => {
  it("accepts flat arrays and names the field and tile of a fault", () => {
    const plan = floorplanFromJson({ rows: 2, cols: 2, tileM: 0.3, blocked: [0, 1, 0, 0], mark: [0, 0, 9, 0], dock: [{ row: 1, col: 1 }] });
    expect(Array.from(plan.mark)).toEqual([0, 0, 9, 0]);
    expect(Array.from(plan.dock)).toEqual([0, 0, 0, 1]);
    const bad = tryFloorplanFromJson({ rows: 2, cols: 2, blocked: ["00", "0x"] });
    expect(bad).toEqual({ ok: false, error: { reason: expect.stringContaining('"x"'), where: { field: "blocked[1]", row: 1, col: 1 } } });
    expect(tryFloorplanFromJson({ rows: 2, cols: 2, blocked: ["00", "01"], nogo: [{ row: 1, col: 1 }] })).toMatchObject({ ok: false, error: { where: { field: "nogo[0]", row: 1, col: 1 } } });
    expect(tryFloorplanFromJson({ rows: 0, cols: 3, blocked: [] })).toMatchObject({ ok: false, error: { reason: expect.stringContaining("zero size") } });
  });
  it("emptyFloorplan makes an all-free plan of one-foot tiles", () => {
    const plan = emptyFloorplan(3, 7);
    expect(plan.tileM).toBe(0.3048);
    expect(freeTileCount(plan)).toBe(21);
    expect(() => emptyFloorplan(0, 3)).toThrow(RangeError);
  });
});
