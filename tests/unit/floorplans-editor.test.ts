/** The tile editor's pure parts: brushes, strokes, rectangles, resize, undo/redo and the viewport. */
import { describe, expect, it } from "vitest";
import { floorplanFromJson, floorplanToJson } from "../../lib/floorplan/json";
import { emptyFloorplan } from "../../lib/floorplan/plan";
import { historyOf, historyPush, historyRedo, historyUndo } from "../../components/floorplans/history";
import { fillRect, paintTiles, rectBounds, resizePlan, strokeTiles } from "../../components/floorplans/paint";
import { clampedTileAtPoint, fitViewport, tileAtPoint, zoomAt } from "../../components/floorplans/viewport";

const rowsOf = (layer: Uint8Array, cols: number) => Array.from({ length: layer.length / cols }, (_, r) => Array.from(layer.subarray(r * cols, (r + 1) * cols)).join(""));

describe("paint", () => {
  it("blocking a tile clears its mark, dock and no-go; marking or docking a blocked tile frees it", () => {
    let plan = emptyFloorplan(2, 3);
    plan = paintTiles(plan, [{ row: 0, col: 1 }], { kind: "mark", mark: 4 });
    plan = paintTiles(plan, [{ row: 0, col: 1 }], { kind: "dock" });
    plan = paintTiles(plan, [{ row: 1, col: 2 }, { row: 0, col: 0 }], { kind: "blocked" });
    plan = paintTiles(plan, [{ row: 1, col: 0 }], { kind: "nogo" });
    expect(rowsOf(plan.blocked, 3)).toEqual(["100", "001"]);
    expect(rowsOf(plan.mark, 3)).toEqual(["040", "000"]);
    expect(rowsOf(plan.dock, 3)).toEqual(["010", "000"]);
    expect(rowsOf(plan.nogo, 3)).toEqual(["000", "100"]);
    plan = paintTiles(plan, [{ row: 0, col: 1 }], { kind: "blocked" });
    expect([plan.blocked[1], plan.mark[1], plan.dock[1]]).toEqual([1, 0, 0]);
    plan = paintTiles(plan, [{ row: 1, col: 2 }], { kind: "dock" });
    expect([plan.blocked[5], plan.dock[5]]).toEqual([0, 1]);
    // What the editor paints is always a plan the server's strict reader accepts.
    expect(floorplanFromJson(JSON.parse(JSON.stringify(floorplanToJson(plan))))).toEqual(plan);
  });

  it("leaves the input untouched and returns the same plan when nothing changes", () => {
    const plan = emptyFloorplan(3, 4);
    const painted = paintTiles(plan, [{ row: 2, col: 3 }], { kind: "blocked" });
    expect(plan.blocked[11]).toBe(0);
    expect(painted.blocked[11]).toBe(1);
    expect(paintTiles(painted, [{ row: 2, col: 3 }], { kind: "blocked" })).toBe(painted);
    expect(paintTiles(plan, [{ row: 5, col: 0 }, { row: 0, col: -1 }], { kind: "blocked" })).toBe(plan);
  });

  it("a stroke covers every tile between two samples, in order, without gaps", () => {
    expect(strokeTiles({ row: 1, col: 0 }, { row: 3, col: 5 })).toEqual([
      { row: 1, col: 0 },
      { row: 1, col: 1 },
      { row: 2, col: 2 },
      { row: 2, col: 3 },
      { row: 3, col: 4 },
      { row: 3, col: 5 },
    ]);
    const back = strokeTiles({ row: 6, col: 2 }, { row: 2, col: 1 });
    expect(back[0]).toEqual({ row: 6, col: 2 });
    expect(back.at(-1)).toEqual({ row: 2, col: 1 });
    expect(back).toHaveLength(5);
    expect(strokeTiles({ row: 4, col: 4 }, { row: 4, col: 4 })).toEqual([{ row: 4, col: 4 }]);
  });

  it("fills a rectangle from any two opposite corners, clipped to the plan", () => {
    const plan = fillRect(emptyFloorplan(4, 5), { row: 3, col: 4 }, { row: 1, col: 2 }, { kind: "blocked" });
    expect(rowsOf(plan.blocked, 5)).toEqual(["00000", "00111", "00111", "00111"]);
    expect(rectBounds(plan, { row: -3, col: 1 }, { row: 9, col: 2 })).toEqual({ top: 0, left: 1, bottom: 3, right: 2 });
    const nogo = fillRect(plan, { row: 0, col: 0 }, { row: 1, col: 3 }, { kind: "nogo" });
    expect(rowsOf(nogo.nogo, 5)).toEqual(["11110", "11110", "00000", "00000"]);
    expect(rowsOf(nogo.blocked, 5)).toEqual(["00000", "00001", "00111", "00111"]);
  });

  it("resizes keeping the top-left corner; new tiles are free", () => {
    let plan = emptyFloorplan(3, 4, 0.5);
    plan = paintTiles(plan, [{ row: 0, col: 3 }, { row: 2, col: 0 }], { kind: "blocked" });
    plan = paintTiles(plan, [{ row: 1, col: 1 }], { kind: "mark", mark: 7 });
    const grown = resizePlan(plan, 4, 6);
    expect(grown.tileM).toBe(0.5);
    expect(rowsOf(grown.blocked, 6)).toEqual(["000100", "000000", "100000", "000000"]);
    expect(rowsOf(grown.mark, 6)).toEqual(["000000", "070000", "000000", "000000"]);
    const cut = resizePlan(plan, 2, 3);
    expect(rowsOf(cut.blocked, 3)).toEqual(["000", "000"]);
    expect(cut.mark[4]).toBe(7);
    expect(resizePlan(plan, 3, 4)).toBe(plan);
    expect(() => resizePlan(plan, 0, 4)).toThrow(RangeError);
  });
});

describe("history", () => {
  it("undoes and redoes edits in order, and a new edit drops the redo steps", () => {
    let h = historyOf("a");
    h = historyPush(h, "b");
    h = historyPush(h, "c");
    expect(historyPush(h, "c")).toBe(h);
    h = historyUndo(h);
    expect(h.present).toBe("b");
    h = historyUndo(h);
    expect(h.present).toBe("a");
    expect(historyUndo(h)).toBe(h);
    h = historyRedo(h);
    expect(h.present).toBe("b");
    h = historyPush(h, "d");
    expect(h.future).toEqual([]);
    expect(historyRedo(h)).toBe(h);
    expect(h.past).toEqual(["a", "b"]);
  });

  it("keeps at most `limit` steps back", () => {
    let h = historyOf(0);
    for (let i = 1; i <= 7; i++) h = historyPush(h, i, 3);
    expect(h.past).toEqual([4, 5, 6]);
    expect(h.present).toBe(7);
  });
});

describe("viewport", () => {
  it("fits and centres the plan, and maps points to tiles", () => {
    const view = fitViewport(20, 30, 600, 500);
    expect(view).toEqual({ scale: 20, offsetX: 0, offsetY: 50 });
    expect(tileAtPoint(view, 45, 91, 20, 30)).toEqual({ row: 2, col: 2 });
    expect(tileAtPoint(view, 45, 49, 20, 30)).toBeNull();
    expect(clampedTileAtPoint(view, 700, 10, 20, 30)).toEqual({ row: 0, col: 29 });
  });

  it("zooming keeps the tile under the pointer in place", () => {
    const view = { scale: 10, offsetX: 5, offsetY: -20 };
    const zoomed = zoomAt(view, 2.5, 137, 64);
    expect(zoomed.scale).toBe(25);
    expect(tileAtPoint(zoomed, 137, 64, 100, 100)).toEqual(tileAtPoint(view, 137, 64, 100, 100));
    expect(zoomAt(view, 100, 0, 0).scale).toBe(64);
  });
});
