/**
 * The on-board controllers that carry out one tile action (PROTOCOL.md `next`) on the
 * plant of robot-physics.ts, using only what a robot can sense: its gyro heading estimate,
 * its wheel encoders and its bump switch — never the true pose.
 *
 * - `forward` drives one tile length of encoder travel along the tile heading nearest to
 *   the current estimate, with a trapezoidal speed profile; a gyro-fed PID (lib createPid)
 *   holds the heading, its output a turn rate. With the hold off the wheels get equal
 *   commands and wheel bias and slip bend the path.
 * - `left`/`right`, differential: turn in place until the gyro estimate reaches the target.
 *   With turnTarget "grid" the target is the grid heading 90° from the nearest grid heading
 *   of the estimate (the robot re-squares on the commanded heading each turn); "relative"
 *   turns 90° from wherever it points, so termination errors add up from turn to turn.
 *   What is left is gyro error plus where the loop stops: 90° is not always 90°.
 * - `left`/`right`, bicycle: a quarter circle of radius one tile (ending one tile ahead and
 *   one to that side, turned 90°), steering from the feed-forward curvature plus the PID on
 *   the heading the arc should have reached at the distance counted so far.
 * - `stay`: stands still.
 * Every action ends with the motors stopped and still; a bump, a time limit, or (forward
 * with the hold) a heading error the loop cannot bring back, as when a wheel jams, ends it early.
 * The PID's output is a turn rate (rad/s per rad of error); for the bicycle it becomes a
 * steering angle through δ = atan(ω·L/v).
 * Reference: CHECKS.md "PID" and "Facts of the trade" (gyro-fed heading hold, turn error
 * accumulation, common practice); the bicycle's curvature from CHECKS.md "Drive kinematics".
 */
import { createPid, defaultHeadingGains, wrapRadians, type Pid } from "../lib/control";
import type { Action } from "../lib/vocabulary";
import { stepRobot, stopCommand, type DriveCommand, type SimState } from "./robot-physics";
import type { Rng } from "./rng";

export interface ControlParams {
  /** Heading controller gains: turn rate in rad/s per rad of heading error (kp), per rad·s (ki), per rad/s (kd). */
  pid: { kp: number; ki: number; kd: number };
  /** Hold the heading with the PID while driving forward. */
  headingHold: boolean;
  turnTarget: "grid" | "relative";
  cruiseMS: number;
  decelMS2: number;
  maxTurnRateRadS: number;
  /** A turn is over once the heading error is below this and the turn rate is small. */
  turnToleranceRad: number;
  /** Longest time an action may take before the robot gives up, seconds. */
  maxActionS: number;
  /** Heading error at which a held forward move gives up (a jammed wheel pivots the robot), radians. */
  maxHeadingErrorRad: number;
  /** Longest wait for the wheels to come to rest at the end, seconds. */
  settleS: number;
}

/** Default controller settings for the demo robots (gains picked by hand on the plant of robot-physics.ts). */
export function defaultControlParams(): ControlParams {
  return {
    pid: defaultHeadingGains(),
    headingHold: true,
    turnTarget: "grid",
    cruiseMS: 0.2,
    decelMS2: 0.4,
    maxTurnRateRadS: 2.5,
    turnToleranceRad: (0.75 * Math.PI) / 180,
    maxActionS: 8,
    maxHeadingErrorRad: (25 * Math.PI) / 180,
    settleS: 1,
  };
}

/** What the robot itself reports after an action: encoder distance, gyro turn, and how it ended. */
export interface ActionReport {
  action: Action;
  /** Mean counted wheel travel, metres (negative when backing). */
  distanceM: number;
  /** Change of the gyro heading estimate, degrees, counter-clockwise positive. */
  turnDeg: number;
  bumped: boolean;
  /** The robot gave up: out of time, or a held heading it could not keep. */
  gaveUp: boolean;
  aborted: boolean;
  durationS: number;
}

export interface ActionController {
  readonly action: Action;
  readonly finished: boolean;
  /** The drive command for the next step, from the robot's own sensors in `state`. */
  command(state: SimState, dtS: number): DriveCommand;
  /** Stops the action early (a hold): the robot brakes and the action finishes once it is still. */
  abort(): void;
  report(): ActionReport;
}

const QUARTER = Math.PI / 2;
const ARRIVED_M = 0.0005;
const CREEP_MS = 0.015;
const STILL_RAD_S = 0.02;
const MIN_STEER_SPEED_MS = 0.05;

/** The multiple of π/2 nearest to an angle. */
function nearestGrid(angleRad: number): number {
  return wrapRadians(Math.round(angleRad / QUARTER) * QUARTER);
}

const meanEncoder = (state: SimState) => (state.encoderLeftM + state.encoderRightM) / 2;

/** Creates the controller for `action`, starting from `state` (its estimate and encoders are the reference). */
export function createActionController(action: Action, state: SimState, control: ControlParams): ActionController {
  const drive = state.params.drive;
  const tileM = state.plan.tileM;
  const startS = state.timeS;
  const startEncoder = meanEncoder(state);
  const startHeading = state.estimate.headingRad;
  const base = control.turnTarget === "grid" || action === "forward" ? nearestGrid(startHeading) : startHeading;
  const side = action === "left" ? 1 : action === "right" ? -1 : 0;
  const isArc = drive.kind === "bicycle" && side !== 0;
  const arcLengthM = QUARTER * tileM;
  const target = isArc ? base + side * QUARTER : wrapRadians(base + side * QUARTER);
  const pid: Pid = createPid({ ...control.pid, outMin: -control.maxTurnRateRadS, outMax: control.maxTurnRateRadS });

  let phase: "run" | "settle" | "done" = action === "stay" ? "settle" : "run";
  // Null while an abort waits for the next command to learn the time.
  let settleStartS: number | null = action === "stay" ? startS : 0;
  let previousHeading = startHeading;
  let previousEncoder = startEncoder;
  let turnedRad = 0;
  let bumped = false;
  let gaveUp = false;
  let aborted = false;
  let endS = startS;
  let endEncoder = startEncoder;

  const enterSettle = (timeS: number) => {
    phase = "settle";
    settleStartS = timeS;
  };

  const speedFor = (remainingM: number) => Math.min(control.cruiseMS, Math.max(CREEP_MS, Math.sqrt(2 * control.decelMS2 * Math.max(0, remainingM))));

  const wheels = (v: number, omega: number): DriveCommand => {
    if (drive.kind === "differential") {
      let left = v - (omega * drive.trackM) / 2;
      let right = v + (omega * drive.trackM) / 2;
      const over = Math.max(Math.abs(left), Math.abs(right)) / drive.maxWheelMS;
      if (over > 1) {
        left /= over;
        right /= over;
      }
      return { kind: "differential", leftMS: left, rightMS: right };
    }
    const steer = Math.atan((omega * drive.wheelbaseM) / Math.max(Math.abs(v), MIN_STEER_SPEED_MS));
    return { kind: "bicycle", speedMS: v, steerRad: Math.max(-drive.maxSteerRad, Math.min(drive.maxSteerRad, steer)) };
  };

  const controller: ActionController = {
    action,
    get finished() {
      return phase === "done";
    },
    abort() {
      if (phase !== "run") return;
      aborted = true;
      phase = "settle";
      settleStartS = null;
    },
    command(current, dtS) {
      const stop = stopCommand(drive.kind);
      if (phase === "done") return stop;
      const heading = current.estimate.headingRad;
      const rate = wrapRadians(heading - previousHeading) / dtS;
      turnedRad += wrapRadians(heading - previousHeading);
      previousHeading = heading;
      const encoder = meanEncoder(current);
      const encoderRate = (encoder - previousEncoder) / dtS;
      previousEncoder = encoder;
      const travelled = encoder - startEncoder;
      if (settleStartS === null) settleStartS = current.timeS;

      if (phase === "run") {
        if (current.bumped) {
          bumped = true;
          enterSettle(current.timeS);
        } else if (current.timeS - startS > control.maxActionS) {
          gaveUp = true;
          enterSettle(current.timeS);
        } else if (action === "forward" && control.headingHold && Math.abs(wrapRadians(target - heading)) > control.maxHeadingErrorRad) {
          gaveUp = true;
          enterSettle(current.timeS);
        }
      }
      if (phase === "run") {
        if (action === "forward" || isArc) {
          const lengthM = isArc ? arcLengthM : tileM;
          const remaining = lengthM - travelled;
          if (remaining <= ARRIVED_M) {
            enterSettle(current.timeS);
          } else {
            const v = speedFor(remaining);
            const reference = isArc ? base + (side * travelled) / tileM : target;
            const feedForward = isArc ? (side * v) / tileM : 0;
            const correction = control.headingHold || isArc ? pid.step(wrapRadians(reference - heading), dtS) : 0;
            return wheels(v, feedForward + correction);
          }
        } else {
          const error = wrapRadians(target - heading);
          if (Math.abs(error) < control.turnToleranceRad && Math.abs(rate) < STILL_RAD_S * 5) {
            enterSettle(current.timeS);
          } else {
            return wheels(0, pid.step(error, dtS));
          }
        }
      }
      // Settling: brake and wait until the encoders and the gyro say the robot is still.
      const still = Math.abs(encoderRate) < 1e-4 && Math.abs(rate) < STILL_RAD_S;
      const settlingS = current.timeS - (settleStartS ?? current.timeS);
      if ((still && settlingS > 0) || settlingS > control.settleS) {
        phase = "done";
        endS = current.timeS;
        endEncoder = encoder;
      }
      return stop;
    },
    report() {
      return {
        action,
        distanceM: endEncoder - startEncoder,
        turnDeg: (turnedRad * 180) / Math.PI,
        bumped,
        gaveUp,
        aborted,
        durationS: endS - startS,
      };
    },
  };
  return controller;
}

/** Runs one whole action on the plant with fixed steps of dtS seconds (default 10 ms); returns the final state and the robot's report. */
export function runAction(state: SimState, action: Action, control: ControlParams, rng: Rng, dtS = 0.01): { state: SimState; report: ActionReport } {
  if (!(dtS > 0)) throw new RangeError("runAction: dtS must be positive");
  const controller = createActionController(action, state, control);
  const maxSteps = Math.ceil((control.maxActionS + 2 * control.settleS) / dtS) + 2;
  let current = state;
  for (let i = 0; i < maxSteps; i++) {
    const command = controller.command(current, dtS);
    if (controller.finished) break;
    current = stepRobot(current, command, dtS, rng);
  }
  return { state: current, report: controller.report() };
}
