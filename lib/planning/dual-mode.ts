/**
 * The state a spread belief acts as in dual-mode control (Cassandra, Kaelbling and Kurien,
 * 1996; from memory): while unsure, the robot follows the policy of one likely state, whose
 * moves past walls and marks sharpen the belief.
 *
 * That state is the most likely one off the goal tile. When the goal itself is the most
 * likely tile, its policy says stay, and staying or turning on the spot cannot tell the goal
 * from a look-alike corner elsewhere: the robot would turn there until the mission ran out
 * of steps. Acting as the best hypothesis elsewhere moves it, which separates the two; if it
 * was at the goal after all, the moves bring it back.
 */
import type { Floorplan, Tile } from "../floorplan/types";

/** Index (stateIndex order) of the most likely state not on `goal`; -1 when all the mass is on it. */
export function dualModeState(plan: Pick<Floorplan, "cols">, belief: ArrayLike<number>, goal: Tile): number {
  const goalBase = (goal.row * plan.cols + goal.col) * 4;
  let best = -1;
  let bestMass = 0;
  for (let s = 0; s < belief.length; s++) {
    if (s >= goalBase && s < goalBase + 4) continue;
    if (belief[s] > bestMass) {
      bestMass = belief[s];
      best = s;
    }
  }
  return best;
}
