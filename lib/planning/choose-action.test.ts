import { describe, expect, it } from "vitest";
import { buildTransitions, defaultMotion, type MotionModel } from "../motion";
import { ACTIONS } from "../vocabulary";
import { chooseAction, qmdpCosts } from "./choose-action";
import { planPolicy } from "./plan-policy";
import { planFromLines } from "../../tests/support/plans";

const N = 0;
const E = 1;
const W = 3;

describe("chooseAction (QMDP) in a corridor, deterministic moves", () => {
  // One-row corridor of 7 tiles, goal at col 3; forward 1, turn 0.5, bump 5, stay = one forward step.
  const plan = planFromLines(["......."]);
  const model: MotionModel = { ...defaultMotion("differential"), forward: { ok: 1, stall: 0, over: 0 }, turn: { ok: 1, none: 0, reverse: 0 }, cost: { forward: 1, turn: 0.5, bump: 5 } };
  const table = buildTransitions(plan, model);
  const policy = planPolicy(plan, { row: 0, col: 3 }, model);
  const at = (col: number, heading: number) => col * 4 + heading;

  it("takes the policy's action for a belief concentrated on one state", () => {
    const belief = new Float64Array(28);
    belief[at(1, E)] = 1;
    expect(chooseAction(plan, policy, belief, { table })).toBe("forward");
    belief.fill(0);
    belief[at(5, E)] = 1;
    // Facing away from the goal: turn (left and right tie at 0.5 + V = 3.5, the earlier action wins).
    expect(chooseAction(plan, policy, belief, { table })).toBe("left");
  });

  it("weighs a two-peak belief: the likelier peak says forward, the expected cost says left", () => {
    // 0.6 at (col 1, E): Q forward 2, left 3, right 3, stay 3.
    // 0.4 at (col 5, N): Q forward 1 + 5 + 2.5 = 8.5 (bump), left 0.5 + 2 = 2.5, right 0.5 + 3 = 3.5, stay 3.5.
    // Weighted: forward 4.6, left 2.8, right 3.2, stay 3.2 (worked by hand from the QMDP sum).
    const belief = new Float64Array(28);
    belief[at(1, E)] = 0.6;
    belief[at(5, N)] = 0.4;
    const { cost, goalMass } = qmdpCosts(plan, policy, belief, { table });
    expect(goalMass).toBe(0);
    expect(cost[0]).toBeCloseTo(4.6, 12);
    expect(cost[1]).toBeCloseTo(2.8, 12);
    expect(cost[2]).toBeCloseTo(3.2, 12);
    expect(cost[3]).toBeCloseTo(3.2, 12);
    expect(ACTIONS[policy.action[at(1, E)]]).toBe("forward");
    expect(chooseAction(plan, policy, belief, { table })).toBe("left");
  });

  it("says stay once most of the belief sits on the goal tile, and not before", () => {
    const belief = new Float64Array(28);
    belief[at(3, W)] = 0.35;
    belief[at(3, N)] = 0.3;
    belief[at(6, E)] = 0.35;
    expect(chooseAction(plan, policy, belief, { table })).toBe("stay");
    belief[at(3, N)] = 0.1;
    belief[at(6, E)] = 0.55;
    expect(chooseAction(plan, policy, belief, { table })).not.toBe("stay");
    expect(chooseAction(plan, policy, belief, { table, goalMass: 0.3 })).toBe("stay");
  });

  it("builds the table from the policy's model when none is given", () => {
    const belief = new Float64Array(28);
    belief[at(1, E)] = 0.6;
    belief[at(5, N)] = 0.4;
    expect(chooseAction(plan, policy, belief)).toBe("left");
  });
});

describe("chooseAction with unreachable states", () => {
  it("counts a walled-off peak as a large finite cost and still chooses by the reachable mass", () => {
    // Tiles (0,0)-(0,1) are walled off from the goal at (2,3).
    const plan = planFromLines(["..#.", "##..", "...."]);
    const model = defaultMotion("differential");
    const table = buildTransitions(plan, model);
    const policy = planPolicy(plan, { row: 2, col: 3 }, model, { table });
    expect(policy.value[0]).toBe(-1);
    const belief = new Float64Array(48);
    belief[0 * 4 + E] = 0.5;
    belief[(1 * 4 + 3) * 4 + N] = 0.5;
    const { cost } = qmdpCosts(plan, policy, belief, { table });
    expect(cost.every((c) => Number.isFinite(c))).toBe(true);
    // From (1,3) facing N the goal (2,3) is behind: a turn beats driving on, whatever the walled-off peak does.
    const choice = chooseAction(plan, policy, belief, { table });
    expect(["left", "right"]).toContain(choice);
  });
});

describe("chooseAction agrees with the policy on point beliefs (default stochastic model)", () => {
  it("returns the planned action wherever that action is optimal by a clear margin", () => {
    const plan = planFromLines(["......#...", "..##......", "......##..", ".#........", "....#....."]);
    const model = defaultMotion("differential");
    const table = buildTransitions(plan, model);
    const policy = planPolicy(plan, { row: 3, col: 7 }, model, { table, epsilon: 1e-12 });
    const belief = new Float64Array(table.states);
    let compared = 0;
    for (let s = 0; s < table.states; s++) {
      if (policy.value[s] <= 0) continue;
      belief.fill(0);
      belief[s] = 1;
      const { cost } = qmdpCosts(plan, policy, belief, { table });
      const sorted = Array.from(cost).sort((a, b) => a - b);
      if (sorted[1] - sorted[0] < 1e-6) continue;
      expect(chooseAction(plan, policy, belief, { table })).toBe(ACTIONS[policy.action[s]]);
      // With a point belief the QMDP sum is the Bellman backup, whose minimum is the value itself.
      expect(sorted[0]).toBeCloseTo(policy.value[s], 8);
      compared++;
    }
    expect(compared).toBeGreaterThan(100);
  });
});
