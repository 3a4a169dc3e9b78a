import createGraph from "ngraph.graph";
import { aStar } from "ngraph.path";
import { describe, expect, it } from "vitest";
import type { Floorplan } from "../floorplan/types";
import { HEADING_STEP, type Action } from "../vocabulary";
import { costToGoal, shortestTurns } from "./shortest-turns";
import { planFromLines, randomPlan } from "../../tests/support/plans";

/** The (tile, heading) graph built independently with ngraph: forward one free tile, quarter turns in place. */
function referenceGraph(plan: Floorplan, goal: { row: number; col: number }, cost: { forward: number; turn: number }) {
  const graph = createGraph<unknown, number>();
  const id = (r: number, c: number, h: number) => `${r},${c},${h}`;
  for (let r = 0; r < plan.rows; r++) {
    for (let c = 0; c < plan.cols; c++) {
      if (plan.blocked[r * plan.cols + c]) continue;
      for (let h = 0; h < 4; h++) {
        graph.addLink(id(r, c, h), id(r, c, (h + 3) % 4), cost.turn);
        graph.addLink(id(r, c, h), id(r, c, (h + 1) % 4), cost.turn);
        const [dr, dc] = HEADING_STEP[h];
        const nr = r + dr;
        const nc = c + dc;
        if (nr >= 0 && nr < plan.rows && nc >= 0 && nc < plan.cols && !plan.blocked[nr * plan.cols + nc]) graph.addLink(id(r, c, h), id(nr, nc, h), cost.forward);
        if (r === goal.row && c === goal.col) graph.addLink(id(r, c, h), "goal", 0);
      }
    }
  }
  const finder = aStar(graph, { oriented: true, distance: (_from, _to, link) => link.data });
  return {
    /** Cost of the cheapest route from (r, c, h) to the goal tile, or null when there is none. */
    cost(r: number, c: number, h: number): number | null {
      if (!graph.getNode(id(r, c, h)) || !graph.getNode("goal")) return null;
      const path = finder.find(id(r, c, h), "goal");
      if (path.length === 0) return null;
      let total = 0;
      // ngraph.path returns the route from the target back to the source.
      for (let i = path.length - 1; i > 0; i--) total += graph.getLink(path[i].id, path[i - 1].id)!.data;
      return total;
    },
  };
}

/** Replays actions deterministically; returns the end pose and the summed cost, or null on a bump. */
function replay(plan: Floorplan, start: { row: number; col: number; heading: number }, actions: Action[], cost: { forward: number; turn: number }) {
  let { row, col, heading } = start;
  let total = 0;
  for (const action of actions) {
    if (action === "forward") {
      const [dr, dc] = HEADING_STEP[heading];
      row += dr;
      col += dc;
      if (row < 0 || row >= plan.rows || col < 0 || col >= plan.cols || plan.blocked[row * plan.cols + col]) return null;
      total += cost.forward;
    } else if (action === "left" || action === "right") {
      heading = (heading + (action === "left" ? 3 : 1)) % 4;
      total += cost.turn;
    }
  }
  return { row, col, heading, total };
}

describe("shortestTurns on a hand-made plan", () => {
  // . . . .
  // . # # .
  // . . . #      from (2,0) facing N to goal (0,3): up two, turn right, three forward = 2 + 0.5 + 3.
  const plan = planFromLines(["....", ".##.", "...#"]);
  const cost = { forward: 1, turn: 0.5 };

  it("finds the cheapest action sequence", () => {
    const route = shortestTurns(plan, { row: 2, col: 0, heading: "N" }, { row: 0, col: 3 }, cost);
    expect(route).toEqual({ cost: 5.5, actions: ["forward", "forward", "right", "forward", "forward", "forward"] });
  });

  it("turns first when the heading is wrong, taking the cheaper side", () => {
    // Facing W at (2,0): one right turn to N (0.5), then as above.
    const route = shortestTurns(plan, { row: 2, col: 0, heading: 3 }, { row: 0, col: 3 }, cost);
    expect(route?.cost).toBe(6);
    expect(route?.actions[0]).toBe("right");
  });

  it("returns an empty route on the goal and null for blocked or unreachable cases", () => {
    expect(shortestTurns(plan, { row: 0, col: 3, heading: "S" }, { row: 0, col: 3 }, cost)).toEqual({ cost: 0, actions: [] });
    expect(shortestTurns(plan, { row: 1, col: 1, heading: "N" }, { row: 0, col: 3 }, cost)).toBeNull();
    expect(shortestTurns(plan, { row: 0, col: 0, heading: "N" }, { row: 2, col: 3 }, cost)).toBeNull();
    const walled = planFromLines([".#..", "##..", "...."]);
    expect(shortestTurns(walled, { row: 0, col: 0, heading: "E" }, { row: 2, col: 3 }, cost)).toBeNull();
  });

  it("rejects non-integer tiles and bad headings (programmer error)", () => {
    expect(() => shortestTurns(plan, { row: 0.5, col: 0, heading: 0 }, { row: 0, col: 3 })).toThrow(RangeError);
    expect(() => shortestTurns(plan, { row: 0, col: 0, heading: 7 }, { row: 0, col: 3 })).toThrow(RangeError);
  });
});

describe("costToGoal", () => {
  it("marks blocked and walled-off states −1 and never returns Infinity", () => {
    const walled = planFromLines([".#..", "##..", "...."]);
    const value = costToGoal(walled, { row: 2, col: 3 }, { forward: 1, turn: 0.5 });
    expect(value.every((v) => Number.isFinite(v))).toBe(true);
    for (let h = 0; h < 4; h++) {
      expect(value[h]).toBe(-1);
      expect(value[1 * 4 + h]).toBe(-1);
      expect(value[(2 * 4 + 3) * 4 + h]).toBe(0);
    }
    expect(costToGoal(walled, { row: 1, col: 1 }).every((v) => v === -1)).toBe(true);
    expect(costToGoal(walled, { row: 9, col: 1 }).every((v) => v === -1)).toBe(true);
  });
});

describe("shortestTurns and costToGoal against ngraph.path", () => {
  // Reference: ngraph.path's A* with a zero heuristic (i.e. Dijkstra) on a graph built independently here.
  const cases = [
    { seed: 11, rows: 9, cols: 13, density: 0.22, cost: { forward: 1, turn: 0.5 } },
    { seed: 29, rows: 12, cols: 7, density: 0.3, cost: { forward: 1.3, turn: 0.7 } },
    { seed: 47, rows: 10, cols: 10, density: 0.15, cost: { forward: 1, turn: 1.6 } },
  ];
  for (const { seed, rows, cols, density, cost } of cases) {
    it(`agrees on seeded plan ${seed} (${rows}×${cols}, ${density} blocked, turn ${cost.turn})`, () => {
      const plan = randomPlan(seed, rows, cols, density);
      const goal = { row: Math.floor(rows / 2), col: Math.floor(cols / 3) };
      plan.blocked[goal.row * cols + goal.col] = 0;
      const reference = referenceGraph(plan, goal, cost);
      const value = costToGoal(plan, goal, cost);
      let reachable = 0;
      for (let r = 0; r < rows; r++) {
        for (let c = 0; c < cols; c++) {
          for (let h = 0; h < 4; h++) {
            const expected = plan.blocked[r * cols + c] ? null : reference.cost(r, c, h);
            const s = (r * cols + c) * 4 + h;
            if (expected === null) {
              expect(value[s]).toBe(-1);
              if (!plan.blocked[r * cols + c]) expect(shortestTurns(plan, { row: r, col: c, heading: h }, goal, cost)).toBeNull();
              continue;
            }
            reachable++;
            expect(value[s]).toBeCloseTo(expected, 9);
            const route = shortestTurns(plan, { row: r, col: c, heading: h }, goal, cost);
            expect(route?.cost).toBeCloseTo(expected, 9);
            const end = replay(plan, { row: r, col: c, heading: h }, route!.actions, cost);
            expect(end).not.toBeNull();
            expect([end!.row, end!.col]).toEqual([goal.row, goal.col]);
            expect(end!.total).toBeCloseTo(expected, 9);
          }
        }
      }
      expect(reachable).toBeGreaterThan(100);
    });
  }
});
