/**
 * Tessera's tile motion model: the probabilities of the outcomes of one tile
 * action, the kidnap-recovery mixing term, and the planner's action costs.
 *
 * Assumes a robot that is told one tile action at a time (ACTIONS) and whose
 * execution errors are discrete: a forward move stalls or overshoots by one
 * tile, a turn fails or goes too far. The outcome probabilities of each group
 * are normalised by buildTransitions, so they need only be non-negative with a
 * positive sum.
 *
 * Field meanings per drive:
 * - differential: forward.ok = one tile ahead, forward.stall = stays,
 *   forward.over = two tiles ahead; turn.ok = 90° in place, turn.none = no
 *   turn, turn.reverse = 180° in place.
 * - bicycle: forward as above; turn.ok = the commanded arc (one tile ahead and
 *   one to that side, heading turned 90°), turn.none = the arc fails and the
 *   robot stays where it was, turn.reverse = the steering fails and the robot
 *   drives one tile straight ahead (a bicycle cannot spin 180° in place, so the
 *   field is reinterpreted as the straight-on failure).
 *
 * Departs from Probabilistic Robotics §5 (velocity/odometry models) by being
 * a discrete outcome table over tiles rather than a continuous noise model, as
 * in the book's histogram filter (§4.1). The default numbers are Tessera's
 * own starting values for small robots on one-foot tiles, to be tuned per
 * robot in the roster; they are not taken from a source.
 */
import type { Drive } from "../vocabulary";

export interface MotionModel {
  drive: Drive;
  /** Outcome weights of `forward` (non-negative, positive sum). */
  forward: { ok: number; stall: number; over: number };
  /** Outcome weights of `left`/`right` (non-negative, positive sum); see the module header for the bicycle meaning. */
  turn: { ok: number; none: number; reverse: number };
  /** Probability in [0, 1) spread uniformly over all free states after every motion update. */
  mix: number;
  /** Planner costs per action kind, in cost units (one forward tile = 1 by convention). */
  cost: { forward: number; turn: number; bump: number };
}

/** Default motion model for a drive: 80–90 % nominal outcomes, 0.2 % mixing, bump cost 5. */
export function defaultMotion(drive: Drive): MotionModel {
  if (drive === "bicycle") {
    return {
      drive,
      forward: { ok: 0.8, stall: 0.1, over: 0.1 },
      turn: { ok: 0.8, none: 0.12, reverse: 0.08 },
      mix: 0.002,
      cost: { forward: 1, turn: 1.6, bump: 5 },
    };
  }
  return {
    drive,
    forward: { ok: 0.8, stall: 0.1, over: 0.1 },
    turn: { ok: 0.9, none: 0.06, reverse: 0.04 },
    mix: 0.002,
    cost: { forward: 1, turn: 0.5, bump: 5 },
  };
}
