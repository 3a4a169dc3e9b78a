/** Live floor geometry on a hand-made 3 × 4 plan with one tile of each kind. */
import { describe, expect, it } from "vitest";
import type { FloorplanView } from "@/lib/protocol/ops-feed";
import { goalRefusal, headingRotationDeg, ringFraction, routePoints, tileAtPoint, tileKind, tileRuns, tilesOfKind } from "@/components/floor/geometry";

// Row-major 3 × 4:  row 0: . # # .   row 1: D . X m2   row 2: # . m1 .
// (# blocked, X no-go, D dock carrying mark 3, m<n> floor mark of class n)
const plan: FloorplanView = {
  id: 4,
  name: "Test bay",
  versionId: 11,
  version: 2,
  rows: 3,
  cols: 4,
  tileM: 0.3048,
  blocked: [0, 1, 1, 0, 0, 0, 0, 0, 1, 0, 0, 0],
  mark: [0, 0, 0, 0, 3, 0, 0, 2, 0, 0, 1, 0],
  dock: [0, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0],
  nogo: [0, 0, 0, 0, 0, 0, 1, 0, 0, 0, 0, 0],
};

describe("tileKind", () => {
  it("reads each layer, docks over marks", () => {
    expect(tileKind(plan, 0, 1)).toBe("blocked");
    expect(tileKind(plan, 1, 2)).toBe("nogo");
    expect(tileKind(plan, 1, 0)).toBe("dock");
    expect(tileKind(plan, 1, 3)).toBe("mark");
    expect(tileKind(plan, 2, 3)).toBe("free");
  });

  it("lists tiles of a kind with their mark class", () => {
    expect(tilesOfKind(plan, "mark")).toEqual([
      { row: 1, col: 3, mark: 2 },
      { row: 2, col: 2, mark: 1 },
    ]);
    expect(tilesOfKind(plan, "dock")).toEqual([{ row: 1, col: 0, mark: 3 }]);
  });

  it("merges a wall into horizontal runs", () => {
    expect(tileRuns(plan, "blocked")).toEqual([
      [0, 1, 2],
      [2, 0, 1],
    ]);
    expect(tileRuns(plan, "nogo")).toEqual([[1, 2, 1]]);
  });
});

describe("goalRefusal", () => {
  it("refuses blocked, no-go and outside tiles with the tile named", () => {
    expect(goalRefusal(plan, 0, 2)).toBe("Goal tile (0, 2) is blocked");
    expect(goalRefusal(plan, 1, 2)).toBe("Goal tile (1, 2) is a no-go tile");
    expect(goalRefusal(plan, 3, 0)).toBe("Tile (3, 0) is outside the floorplan (3 rows × 4 columns)");
    expect(goalRefusal(plan, 0, -1)).toMatch(/outside/);
    expect(goalRefusal(plan, 0.5, 1)).toMatch(/outside/);
  });

  it("accepts free, marked and dock tiles", () => {
    expect(goalRefusal(plan, 2, 3)).toBeNull();
    expect(goalRefusal(plan, 1, 3)).toBeNull();
    expect(goalRefusal(plan, 1, 0)).toBeNull();
  });
});

describe("tileAtPoint", () => {
  it("maps tile-unit points to tiles, x to columns and y to rows", () => {
    expect(tileAtPoint(plan, 3.999, 0.01)).toEqual({ row: 0, col: 3 });
    expect(tileAtPoint(plan, 1.5, 2.5)).toEqual({ row: 2, col: 1 });
    expect(tileAtPoint(plan, 0, 0)).toEqual({ row: 0, col: 0 });
  });

  it("answers null outside the plan or for non-finite points", () => {
    expect(tileAtPoint(plan, 4, 1)).toBeNull();
    expect(tileAtPoint(plan, 1, 3)).toBeNull();
    expect(tileAtPoint(plan, -0.01, 1)).toBeNull();
    expect(tileAtPoint(plan, Number.NaN, 1)).toBeNull();
  });
});

describe("drawing helpers", () => {
  it("turns headings clockwise from north", () => {
    expect(["N", "E", "S", "W"].map((h) => headingRotationDeg(h as "N"))).toEqual([0, 90, 180, 270]);
  });

  it("draws a route through tile centres from the estimate", () => {
    expect(routePoints([{ row: 2, col: 3 }, { row: 2, col: 4 }], { row: 1, col: 3 })).toBe("3.5,1.5 3.5,2.5 4.5,2.5");
    expect(routePoints([{ row: 0, col: 1 }])).toBe("1.5,0.5");
  });

  it("clamps the certainty ring to [0, 1]", () => {
    expect(ringFraction(0.37)).toBe(0.37);
    expect(ringFraction(1.2)).toBe(1);
    expect(ringFraction(-0.1)).toBe(0);
    expect(ringFraction(Number.NaN)).toBe(0);
  });
});
