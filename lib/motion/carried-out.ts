/**
 * The tile action a `moved` report says actually happened, read from its odometry.
 *
 * The motion model (model.ts) spreads the outcomes of a commanded action; when the robot
 * reports its encoder travel and gyro turn, an outcome the odometry rules out is not worth
 * its prior weight. A bumped forward that counted a millimetre of travel did not advance a
 * tile, and a turn that counted 1° did not turn, so predicting the commanded move would
 * carry the belief away from the robot for as long as it stays wedged. Thresholds are half a
 * tile and half a quarter turn: odometry is trusted for whether a move happened, not for how
 * far (wheel slip makes the encoders overstate travel, never understate it by half a tile).
 * Common practice: odometry-conditioned prediction (Probabilistic Robotics §5.4, the
 * odometry motion model; from memory), reduced here to a gate on the discrete action.
 */
import type { Action } from "../vocabulary";

export interface Odometry {
  distanceM: number;
  turnDeg: number;
}

/** The action to predict with: the commanded one, "forward" for a turn that drove straight on, or "stay" for a move that did not happen. */
export function actionCarriedOut(action: Action, odometry: Odometry | undefined, tileM: number): Action {
  if (!odometry || action === "stay") return action;
  const travelled = Math.abs(odometry.distanceM) >= tileM / 2;
  if (action === "forward") return travelled ? "forward" : "stay";
  if (Math.abs(odometry.turnDeg) >= 45) return action;
  // A bicycle whose steering failed drives one tile straight ahead; a turn in place never travels half a tile.
  return travelled ? "forward" : "stay";
}
