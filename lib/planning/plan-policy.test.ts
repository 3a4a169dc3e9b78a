import fc from "fast-check";
import createGraph from "ngraph.graph";
import { aStar } from "ngraph.path";
import { describe, expect, it } from "vitest";
import type { Floorplan } from "../floorplan/types";
import { buildTransitions, defaultMotion, type MotionModel } from "../motion";
import { HEADING_STEP, NO_ACTION } from "../vocabulary";
import { planPolicy } from "./plan-policy";
import { costToGoal, shortestTurns } from "./shortest-turns";
import { solveMdp } from "./solve-mdp";
import { planFromLines, randomPlan } from "../../tests/support/plans";

/** The motion model with every commanded move succeeding (the deterministic case). */
function exact(drive: "differential" | "bicycle", cost: MotionModel["cost"]): MotionModel {
  return { ...defaultMotion(drive), forward: { ok: 1, stall: 0, over: 0 }, turn: { ok: 1, none: 0, reverse: 0 }, cost };
}

/** Cheapest deterministic route cost per state by ngraph.path (Dijkstra: A* with zero heuristic), null if none. */
function ngraphCosts(plan: Floorplan, goal: { row: number; col: number }, cost: { forward: number; turn: number }) {
  const graph = createGraph<unknown, number>();
  const id = (s: number) => String(s);
  for (let tile = 0; tile < plan.rows * plan.cols; tile++) {
    if (plan.blocked[tile]) continue;
    const r = Math.floor(tile / plan.cols);
    const c = tile % plan.cols;
    for (let h = 0; h < 4; h++) {
      const s = tile * 4 + h;
      graph.addLink(id(s), id(tile * 4 + ((h + 3) % 4)), cost.turn);
      graph.addLink(id(s), id(tile * 4 + ((h + 1) % 4)), cost.turn);
      const [dr, dc] = HEADING_STEP[h];
      const nr = r + dr;
      const nc = c + dc;
      if (nr >= 0 && nr < plan.rows && nc >= 0 && nc < plan.cols && !plan.blocked[nr * plan.cols + nc]) graph.addLink(id(s), id((nr * plan.cols + nc) * 4 + h), cost.forward);
      if (r === goal.row && c === goal.col) graph.addLink(id(s), "goal", 0);
    }
  }
  const finder = aStar(graph, { oriented: true, distance: (_f, _t, link) => link.data });
  return (s: number): number | null => {
    if (!graph.getNode(id(s))) return null;
    const path = finder.find(id(s), "goal");
    if (path.length === 0) return null;
    let total = 0;
    for (let i = path.length - 1; i > 0; i--) total += graph.getLink(path[i].id, path[i - 1].id)!.data;
    return total;
  };
}

describe("planPolicy in the deterministic case against ngraph.path", () => {
  // Reference: ngraph.path shortest paths on an independently built (tile, heading) graph; with ok = 1
  // the MDP's expected cost-to-go is the shortest-route cost.
  const cases = [
    { seed: 5, rows: 10, cols: 14, density: 0.2, cost: { forward: 1, turn: 0.5, bump: 5 } },
    { seed: 17, rows: 13, cols: 9, density: 0.28, cost: { forward: 1.2, turn: 0.9, bump: 3 } },
    { seed: 23, rows: 8, cols: 8, density: 0.1, cost: { forward: 1, turn: 1.7, bump: 4 } },
  ];
  for (const { seed, rows, cols, density, cost } of cases) {
    it(`agrees with ngraph.path, costToGoal and shortestTurns on seeded plan ${seed}`, () => {
      const plan = randomPlan(seed, rows, cols, density);
      const goal = { row: rows - 2, col: 1 };
      plan.blocked[goal.row * cols + goal.col] = 0;
      const policy = planPolicy(plan, goal, exact("differential", cost), { epsilon: 1e-12 });
      expect(policy.converged).toBe(true);
      const reference = ngraphCosts(plan, goal, cost);
      const deterministic = costToGoal(plan, goal, cost);
      let reachable = 0;
      for (let s = 0; s < rows * cols * 4; s++) {
        const expected = reference(s);
        if (expected === null) {
          expect(policy.value[s]).toBe(-1);
          expect(policy.action[s]).toBe(NO_ACTION);
          continue;
        }
        reachable++;
        expect(policy.value[s]).toBeCloseTo(expected, 9);
        expect(deterministic[s]).toBeCloseTo(expected, 9);
        const tile = s >> 2;
        const route = shortestTurns(plan, { row: Math.floor(tile / cols), col: tile % cols, heading: s & 3 }, goal, cost);
        expect(route?.cost).toBeCloseTo(expected, 9);
      }
      expect(reachable).toBeGreaterThan(150);
    });
  }
});

describe("planPolicy properties (fast-check)", () => {
  const arbitraryCase = fc.record({
    seed: fc.integer({ min: 1, max: 1_000_000 }),
    rows: fc.integer({ min: 2, max: 9 }),
    cols: fc.integer({ min: 2, max: 11 }),
    density: fc.double({ min: 0, max: 0.45, noNaN: true }),
    goalPick: fc.double({ min: 0, max: 0.999, noNaN: true }),
    turn: fc.constantFrom(0.5, 0.8, 1.6),
  });

  it("follows a strictly falling cost-to-go to the goal and never enters a blocked tile (deterministic case)", () => {
    fc.assert(
      fc.property(arbitraryCase, ({ seed, rows, cols, density, goalPick, turn }) => {
        const plan = randomPlan(seed, rows, cols, density);
        const goalTile = Math.floor(goalPick * rows * cols);
        plan.blocked[goalTile] = 0;
        const goal = { row: Math.floor(goalTile / cols), col: goalTile % cols };
        const policy = planPolicy(plan, goal, exact("differential", { forward: 1, turn, bump: 5 }));
        for (let start = 0; start < rows * cols * 4; start++) {
          if (policy.value[start] < 0) continue;
          let s = start;
          for (let steps = 0; (s >> 2) !== goalTile; steps++) {
            expect(steps).toBeLessThan(rows * cols * 4);
            const action = policy.action[s];
            let next: number;
            const tile = s >> 2;
            const h = s & 3;
            if (action === 0) {
              const [dr, dc] = HEADING_STEP[h];
              const r = Math.floor(tile / cols) + dr;
              const c = (tile % cols) + dc;
              expect(r >= 0 && r < rows && c >= 0 && c < cols && plan.blocked[r * cols + c] === 0).toBe(true);
              next = (r * cols + c) * 4 + h;
            } else if (action === 1 || action === 2) {
              next = tile * 4 + ((h + (action === 1 ? 3 : 1)) % 4);
            } else {
              throw new Error(`action ${action} off the goal`);
            }
            expect(policy.value[next]).toBeLessThan(policy.value[s]);
            s = next;
          }
          expect(policy.action[s]).toBe(3);
        }
      }),
      { seed: 20_251_201, numRuns: 60 },
    );
  });

  it("marks unreachable states −1 / NO_ACTION and never yields Infinity or NaN (default stochastic model)", () => {
    fc.assert(
      fc.property(arbitraryCase, fc.constantFrom<"differential" | "bicycle">("differential", "bicycle"), ({ seed, rows, cols, density, goalPick }, drive) => {
        const plan = randomPlan(seed, rows, cols, density);
        const goalTile = Math.floor(goalPick * rows * cols);
        plan.blocked[goalTile] = 0;
        const goal = { row: Math.floor(goalTile / cols), col: goalTile % cols };
        const policy = planPolicy(plan, goal, defaultMotion(drive));
        const deterministic = costToGoal(plan, goal);
        for (let s = 0; s < rows * cols * 4; s++) {
          expect(Number.isFinite(policy.value[s])).toBe(true);
          const blocked = plan.blocked[s >> 2] === 1;
          if (blocked || policy.value[s] === -1) {
            expect(policy.action[s]).toBe(NO_ACTION);
            continue;
          }
          expect(policy.value[s]).toBeGreaterThanOrEqual(0);
          // Nothing is reachable by chance that a deterministic route cannot reach.
          expect(deterministic[s]).toBeGreaterThanOrEqual(0);
          if ((s >> 2) === goalTile) {
            expect(policy.value[s]).toBe(0);
            expect(policy.action[s]).toBe(3);
          } else {
            expect(policy.action[s]).toBeLessThan(3);
            if (policy.action[s] === 0) {
              // Never drive forward into a blocked tile or off the plan.
              const [dr, dc] = HEADING_STEP[s & 3];
              const r = Math.floor((s >> 2) / cols) + dr;
              const c = ((s >> 2) % cols) + dc;
              expect(r >= 0 && r < rows && c >= 0 && c < cols && plan.blocked[r * cols + c] === 0).toBe(true);
            }
          }
        }
        if (drive === "differential") {
          for (let s = 0; s < rows * cols * 4; s++) expect(policy.value[s] >= 0).toBe(deterministic[s] >= 0);
        }
      }),
      { seed: 7_777, numRuns: 50 },
    );
  });

  it("gives −1 / NO_ACTION everywhere for a blocked, walled-off or off-plan goal", () => {
    const plan = planFromLines(["..#.", "..#.", "###.", "...."]);
    const walledOff = planPolicy(plan, { row: 0, col: 0 });
    for (let s = 0; s < 64; s++) {
      const tile = s >> 2;
      const inPocket = [0, 1, 4, 5].includes(tile);
      expect(walledOff.value[s] >= 0).toBe(inPocket);
      if (!inPocket) expect(walledOff.action[s]).toBe(NO_ACTION);
    }
    for (const goal of [{ row: 2, col: 0 }, { row: -1, col: 2 }, { row: 1, col: 4 }]) {
      const policy = planPolicy(plan, goal);
      expect(policy.value.every((v) => v === -1)).toBe(true);
      expect(policy.action.every((a) => a === NO_ACTION)).toBe(true);
    }
    const nogo = planFromLines(["....", "...."]);
    nogo.nogo[5] = 1;
    expect(planPolicy(nogo, { row: 1, col: 1 }).value.every((v) => v === -1)).toBe(true);
  });
});

describe("planPolicy against the generic solveMdp", () => {
  // solveMdp is checked against the AIMA and Sutton–Barto worlds; here it is the independent reference.
  it("reaches the same values and optimal actions as plain value iteration (differential and bicycle defaults)", () => {
    for (const [seed, drive] of [
      [3, "differential"],
      [8, "bicycle"],
      [14, "bicycle"],
    ] as const) {
      const plan = randomPlan(seed, 6, 7, 0.15);
      const goalTile = 2 * 7 + 3;
      plan.blocked[goalTile] = 0;
      const model = defaultMotion(drive);
      const policy = planPolicy(plan, { row: 2, col: 3 }, model, { epsilon: 1e-12 });
      const table = buildTransitions(plan, model);
      const base = [model.cost.forward, model.cost.turn, model.cost.turn, model.cost.forward];
      const unreachable = (s: number) => policy.value[s] === -1;
      /** Outcomes of (s, a) merged by next state, with the cost expected given that next state. */
      const outcomes = (s: number, a: number) => {
        const merged = new Map<number, { p: number; cost: number }>();
        for (let e = table.offsets[s * 4 + a]; e < table.offsets[s * 4 + a + 1]; e++) {
          const entry = merged.get(table.next[e]) ?? { p: 0, cost: 0 };
          entry.p += table.prob[e];
          entry.cost += table.prob[e] * (base[a] + (table.bumped[e] ? model.cost.bump : 0));
          merged.set(table.next[e], entry);
        }
        return merged;
      };
      const solved = solveMdp(
        {
          states: table.states,
          actions: 4,
          transitions: (s, a) => [...outcomes(s, a)].map(([next, { p }]) => [next, p] as const),
          // Entering a dead end ends the episode at planPolicy's default penalty, 1000 forward steps.
          reward(s, a, next) {
            const { p, cost } = outcomes(s, a).get(next)!;
            return -(cost / p) - (unreachable(next) ? 1000 : 0);
          },
          terminal: (s) => (s >> 2) === goalTile || unreachable(s) || plan.blocked[s >> 2] === 1,
        },
        { discount: 1, epsilon: 1e-11 },
      );
      expect(solved.converged).toBe(true);
      let checked = 0;
      for (let s = 0; s < table.states; s++) {
        if (policy.value[s] <= 0) continue;
        checked++;
        expect(-solved.value[s]).toBeCloseTo(policy.value[s], 6);
        // The planner's action must be optimal under solveMdp's values (ties may break either way).
        const q = [0, 1, 2, 3].map((a) => {
          let total = 0;
          for (const [next, { p, cost }] of outcomes(s, a)) total += -cost - (unreachable(next) ? 1000 * p : 0) + p * solved.value[next];
          return total;
        });
        expect(q[policy.action[s]]).toBeGreaterThan(Math.max(...q) - 1e-6);
      }
      expect(checked).toBeGreaterThan(40);
    }
  });
});

describe("planPolicy with a bicycle", () => {
  it("marks headings that can never turn back in a one-tile corridor as unreachable", () => {
    // A bicycle cannot turn in place and its arcs need side tiles, so in a 1×6 corridor it can only
    // drive straight: facing the goal (west) it is reachable, facing east, north or south it is not.
    const plan = planFromLines(["......"]);
    const model = exact("bicycle", { forward: 1, turn: 1.6, bump: 5 });
    const policy = planPolicy(plan, { row: 0, col: 0 }, model);
    for (let c = 1; c < 6; c++) {
      expect(policy.value[c * 4 + 3]).toBe(c);
      expect(policy.action[c * 4 + 3]).toBe(0);
      for (const h of [0, 1, 2]) {
        expect(policy.value[c * 4 + h]).toBe(-1);
        expect(policy.action[c * 4 + h]).toBe(NO_ACTION);
      }
    }
  });

  it("uses arcs: a right arc from (2,0) facing north lands on (1,1) facing east", () => {
    // Bicycle turn.ok = one tile ahead and one to the side, heading turned 90° (lib/motion model header).
    const plan = planFromLines(["...", "...", "..."]);
    const model = exact("bicycle", { forward: 1, turn: 1.6, bump: 5 });
    const policy = planPolicy(plan, { row: 1, col: 1 }, model);
    expect(policy.value[(2 * 3 + 0) * 4 + 0]).toBeCloseTo(1.6, 12);
    expect(policy.action[(2 * 3 + 0) * 4 + 0]).toBe(2);
    // From (2,1) facing north the goal is one tile straight ahead.
    expect(policy.value[(2 * 3 + 1) * 4 + 0]).toBe(1);
    expect(policy.action[(2 * 3 + 1) * 4 + 0]).toBe(0);
  });
});

describe("planPolicy dead ends", () => {
  it("charges the dead-end penalty for the chance of running straight into a trap", () => {
    // Bicycle, forward always succeeds, arcs succeed with 0.75 and run straight on with 0.25.
    // Plan (row 0 at the top):  . . .   goal (0,0). From (1,1) facing N: forward reaches (0,1) facing the
    //                           . . #   outer wall, a dead end; the right arc ends on (0,2) facing the wall,
    //                           # . #   another; the left arc lands on the goal, or with 0.25 runs on to (0,1).
    const plan = planFromLines(["...", "..#", "#.#"]);
    const model: MotionModel = { ...defaultMotion("bicycle"), forward: { ok: 1, stall: 0, over: 0 }, turn: { ok: 0.75, none: 0, reverse: 0.25 }, cost: { forward: 1, turn: 1.6, bump: 5 } };
    const policy = planPolicy(plan, { row: 0, col: 0 }, model, { deadEndCost: 40, epsilon: 1e-12 });
    const northAt = (r: number, c: number) => (r * 3 + c) * 4;
    expect(policy.value[northAt(0, 1)]).toBe(-1);
    expect(policy.action[northAt(0, 1)]).toBe(NO_ACTION);
    // Arc: 1.6 + 0.25 · 40 = 11.6; forward into the dead end (0,1,N) would cost 1 + 40.
    expect(policy.value[northAt(1, 1)]).toBeCloseTo(11.6, 9);
    expect(policy.action[northAt(1, 1)]).toBe(1);
  });
});

describe("planPolicy options", () => {
  it("reports every sweep, reuses a given table and stops at maxSweeps", () => {
    const plan = randomPlan(99, 12, 12, 0.2);
    plan.blocked[0] = 0;
    const model = defaultMotion("differential");
    const table = buildTransitions(plan, model);
    const changes: number[] = [];
    const full = planPolicy(plan, { row: 0, col: 0 }, model, { table, epsilon: 1e-9, onSweep: (_sweep, change) => changes.push(change) });
    expect(full.converged).toBe(true);
    expect(changes.length).toBe(full.sweeps);
    expect(changes[changes.length - 1]).toBeLessThan(1e-9);
    const capped = planPolicy(plan, { row: 0, col: 0 }, model, { table, epsilon: 1e-12, maxSweeps: 2 });
    expect(capped.sweeps).toBe(2);
    expect(capped.converged).toBe(false);
    expect(capped.value.every((v) => Number.isFinite(v))).toBe(true);
  });

  it("rejects a non-integer goal and a table of another plan (programmer error)", () => {
    const plan = planFromLines(["...", "..."]);
    expect(() => planPolicy(plan, { row: 0.5, col: 1 })).toThrow(RangeError);
    const other = buildTransitions(planFromLines(["..", ".."]), defaultMotion("differential"));
    expect(() => planPolicy(plan, { row: 0, col: 1 }, defaultMotion("differential"), { table: other })).toThrow(RangeError);
  });
});
