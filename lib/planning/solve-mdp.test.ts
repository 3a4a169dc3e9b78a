import { describe, expect, it } from "vitest";
import { evaluatePolicy, solveMdp, type Mdp } from "./solve-mdp";

/** Row/column moves for actions 0..3 = up, right, down, left (row grows downward). */
const MOVES = [
  [-1, 0],
  [0, 1],
  [1, 0],
  [0, -1],
] as const;

/**
 * Russell and Norvig's 4×3 world, AIMA 3rd ed., Fig. 17.1–17.3. Stored with row 0 at the top, so the
 * book's (col, row) from the bottom left is index (3 − row)·4 + (col − 1).
 */
function fourByThree(): Mdp & { cell(col: number, row: number): number } {
  const cell = (col: number, row: number) => (3 - row) * 4 + (col - 1);
  const wall = cell(2, 2);
  const plus = cell(4, 3);
  const minus = cell(4, 2);
  const moveFrom = (s: number, move: number): number => {
    const r = Math.floor(s / 4) + MOVES[move][0];
    const c = (s % 4) + MOVES[move][1];
    if (r < 0 || r > 2 || c < 0 || c > 3) return s;
    const next = r * 4 + c;
    return next === wall ? s : next;
  };
  return {
    cell,
    states: 12,
    actions: 4,
    transitions(s, a) {
      // Intended direction 0.8, each perpendicular 0.1 (book, §17.1).
      return [
        [moveFrom(s, a), 0.8],
        [moveFrom(s, (a + 1) % 4), 0.1],
        [moveFrom(s, (a + 3) % 4), 0.1],
      ];
    },
    reward(_s, _a, next) {
      // R(s) = −0.04 in non-terminal states; the terminal utilities ±1 are paid on entry.
      return -0.04 + (next === plus ? 1 : next === minus ? -1 : 0);
    },
    terminal: (s) => s === plus || s === minus || s === wall,
  };
}

/** Sutton and Barto's 4×4 gridworld, Example 4.1: terminals 0 and 15, reward −1 per step, off-grid stays. */
function fourByFour(): Mdp {
  return {
    states: 16,
    actions: 4,
    transitions(s, a) {
      const r = Math.floor(s / 4) + MOVES[a][0];
      const c = (s % 4) + MOVES[a][1];
      return [[r < 0 || r > 3 || c < 0 || c > 3 ? s : r * 4 + c, 1]];
    },
    reward: () => -1,
    terminal: (s) => s === 0 || s === 15,
  };
}

/** Sutton and Barto's 5×5 gridworld with teleports A → A' (+10) and B → B' (+5), Example 3.5. */
function fiveByFive(): Mdp {
  const a = 1;
  const aPrime = 4 * 5 + 1;
  const b = 3;
  const bPrime = 2 * 5 + 3;
  const land = (s: number, move: number): number => {
    if (s === a) return aPrime;
    if (s === b) return bPrime;
    const r = Math.floor(s / 5) + MOVES[move][0];
    const c = (s % 5) + MOVES[move][1];
    return r < 0 || r > 4 || c < 0 || c > 4 ? s : r * 5 + c;
  };
  return {
    states: 25,
    actions: 4,
    transitions: (s, move) => [[land(s, move), 1]],
    reward(s, _move, next) {
      if (s === a) return 10;
      if (s === b) return 5;
      return next === s ? -1 : 0;
    },
  };
}

describe("solveMdp on Russell and Norvig's 4×3 world", () => {
  const world = fourByThree();
  const solution = solveMdp(world, { discount: 1, epsilon: 1e-12 });
  const u = (col: number, row: number) => solution.value[world.cell(col, row)];

  it("converges", () => {
    expect(solution.converged).toBe(true);
    expect(solution.sweeps).toBeGreaterThan(10);
  });

  it("reproduces the utilities of Fig. 17.3 to three decimals", () => {
    // AIMA 3rd ed., Fig. 17.3 (via CHECKS.md).
    const expected: [number, number, number][] = [
      [1, 3, 0.812], [2, 3, 0.868], [3, 3, 0.918],
      [1, 2, 0.762], [3, 2, 0.66],
      [1, 1, 0.705], [2, 1, 0.655], [3, 1, 0.611], [4, 1, 0.388],
    ];
    for (const [col, row, utility] of expected) expect(Math.abs(u(col, row) - utility)).toBeLessThan(5e-4);
  });

  it("reproduces the six-decimal converged utilities", () => {
    // CHECKS.md, "Converged to six decimals" for the same world.
    const expected: [number, number, number][] = [
      [1, 3, 0.811558], [2, 3, 0.867808], [3, 3, 0.917808],
      [1, 2, 0.761558], [3, 2, 0.660274],
      [1, 1, 0.705308], [2, 1, 0.655308], [3, 1, 0.611416], [4, 1, 0.387925],
    ];
    for (const [col, row, utility] of expected) expect(u(col, row)).toBeCloseTo(utility, 6);
  });

  it("reproduces the optimal policy of Fig. 17.2, including the two narrow margins", () => {
    // AIMA 3rd ed., Fig. 17.2 (via CHECKS.md). Actions: 0 up, 1 right, 2 down, 3 left.
    const policyAt = (col: number, row: number) => solution.policy[world.cell(col, row)];
    expect([policyAt(1, 3), policyAt(2, 3), policyAt(3, 3)]).toEqual([1, 1, 1]);
    expect([policyAt(1, 2), policyAt(3, 2)]).toEqual([0, 0]);
    expect([policyAt(1, 1), policyAt(2, 1), policyAt(3, 1), policyAt(4, 1)]).toEqual([0, 3, 3, 3]);
    expect([policyAt(4, 3), policyAt(4, 2), policyAt(2, 2)]).toEqual([-1, -1, -1]);
  });
});

describe("solveMdp and evaluatePolicy on Sutton and Barto's 4×4 gridworld", () => {
  it("finds minus the steps to the nearer terminal", () => {
    // Sutton and Barto 2nd ed., Example 4.1 (optimal values via CHECKS.md).
    const { value, converged } = solveMdp(fourByFour(), { discount: 1, epsilon: 1e-12 });
    expect(converged).toBe(true);
    expect(Array.from(value)).toEqual([0, -1, -2, -3, -1, -2, -3, -2, -2, -3, -2, -1, -3, -2, -1, 0]);
  });

  it("evaluates the equiprobable random policy", () => {
    // Sutton and Barto 2nd ed., Fig. 4.1, k = ∞ column (via CHECKS.md).
    const { value, converged } = evaluatePolicy(fourByFour(), () => 0.25, { discount: 1, epsilon: 1e-12 });
    expect(converged).toBe(true);
    const expected = [0, -14, -20, -22, -14, -18, -20, -20, -20, -20, -18, -14, -22, -20, -14, 0];
    expected.forEach((v, s) => expect(value[s]).toBeCloseTo(v, 8));
  });

  it("stops at maxSweeps and says it did not converge", () => {
    const result = evaluatePolicy(fourByFour(), () => 0.25, { discount: 1, epsilon: 1e-12, maxSweeps: 3 });
    expect(result.sweeps).toBe(3);
    expect(result.converged).toBe(false);
  });
});

describe("solveMdp on Sutton and Barto's 5×5 teleport gridworld", () => {
  it("reproduces the optimal values to one decimal", () => {
    // Sutton and Barto 2nd ed., Example 3.8 / Fig. 3.5 (via CHECKS.md).
    const { value } = solveMdp(fiveByFive(), { discount: 0.9, epsilon: 1e-10 });
    const expected = [
      22.0, 24.4, 22.0, 19.4, 17.5,
      19.8, 22.0, 19.8, 17.8, 16.0,
      17.8, 19.8, 17.8, 16.0, 14.4,
      16.0, 17.8, 16.0, 14.4, 13.0,
      14.4, 16.0, 14.4, 13.0, 11.7,
    ];
    expected.forEach((v, s) => expect(Math.abs(value[s] - v)).toBeLessThan(0.05 + 1e-9));
  });

  it("rejects a discount above 1 (programmer error)", () => {
    expect(() => solveMdp(fiveByFive(), { discount: 1.1, epsilon: 1e-6 })).toThrow(RangeError);
  });
});
