/**
 * Where a robot steps aside. The search is breadth-first, so the tile it returns is one the
 * fewest moves away (BFS visits tiles in order of distance on an unweighted grid; Cormen et al.,
 * Introduction to Algorithms, ch. 22, cited from memory). The maps are hand-drawn and each
 * expected tile is counted by hand on them.
 */
import { describe, expect, it } from "vitest";
import { parseFloorplan } from "../floorplan/parse";
import { giveWayTile, onRoute } from "./give-way";

// A lab above, a corridor below, and a one-tile doorway at (2, 2) between them.
const doorway = parseFloorplan(["11111", "10001", "11011", "10001", "11111"].join("\n"));

describe("giveWayTile", () => {
  it("backs a robot in a doorway out of the other robot's way, to the nearest tile off its route", () => {
    // The other robot stands at (1, 2) and will go down through the doorway to (3, 1).
    const route = [{ row: 1, col: 2 }, { row: 2, col: 2 }, { row: 3, col: 2 }, { row: 3, col: 1 }];
    // Two moves: down to (3, 2), which is on the route, then east to (3, 3), which is not.
    expect(giveWayTile(doorway, { row: 2, col: 2 }, [{ row: 1, col: 2 }], route)).toEqual({ row: 3, col: 3 });
  });

  it("never passes through the other robot to get there", () => {
    // Its only free neighbour off the route lies beyond the other robot: none is left.
    const corridor = parseFloorplan(["11111", "10001", "11111"].join("\n"));
    const route = [{ row: 1, col: 3 }, { row: 1, col: 2 }, { row: 1, col: 1 }];
    expect(giveWayTile(corridor, { row: 1, col: 2 }, [{ row: 1, col: 3 }], route)).toBeNull();
  });

  it("does not offer the tile it stands on, a blocked tile or a no-go tile", () => {
    // The corridor's east end (3, 3) is no-go, so the west end is the nearest place off the route.
    const marked = parseFloorplan(["11111", "10001", "11011", "10001", "11111", "", ".....", ".....", ".....", "...X.", "....."].join("\n"));
    const route = [{ row: 1, col: 2 }, { row: 2, col: 2 }, { row: 3, col: 2 }];
    expect(giveWayTile(marked, { row: 2, col: 2 }, [{ row: 1, col: 2 }], route)).toEqual({ row: 3, col: 1 });
    expect(giveWayTile(doorway, { row: 3, col: 3 }, [], [])).toEqual({ row: 3, col: 2 });
  });
});

describe("onRoute", () => {
  it("finds a tile among a route's tiles by row and column", () => {
    const route = [{ row: 1, col: 2 }, { row: 2, col: 2 }];
    expect(onRoute(route, { row: 2, col: 2 })).toBe(true);
    expect(onRoute(route, { row: 2, col: 1 })).toBe(false);
  });
});
