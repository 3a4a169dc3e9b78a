/**
 * The continuous-space plant of a simulated Tessera robot: one pure step
 * `stepRobot(state, command, dtS, rng)` from wheel (or speed and steering) commands to the
 * next true pose, encoder counts, gyro reading and battery charge.
 *
 * Frame: x metres to the right (x = col·tileM), y metres downward (y = row·tileM), so the
 * tile of a pose is (floor(y/tileM), floor(x/tileM)). θ is counter-clockwise as the floor
 * is drawn, from +x: heading E is θ = 0, N is π/2 (towards −y), W is π, S is −π/2; the
 * direction of travel is (cos θ, −sin θ). lib/kinematics works in a y-up frame, so the step
 * integrates in (x, −y) and flips back.
 *
 * Physics, per step: actuators approach their commands under an acceleration (or steering
 * rate) limit; a stalled wheel stops dead. A wheel's ground speed is its rotation times
 * (1 + bias) (unequal wheel diameters, a fixed per-robot error) times (1 + slip), where slip
 * is a first-order Gauss–Markov process (correlated noise, so it does not average out within
 * a move as white noise would). Encoders count rotation, not ground travel. The body moves
 * on the exact arc for constant controls over the step. The footprint is a disc. A step
 * that meets a wall at a glancing angle (up to GLANCE_RAD between the motion and the wall)
 * slides along it: the part of the motion into the wall is dropped, as a bumper's side
 * rollers do, and the switch stays open; so does a contact slower than SCRUB_MS, such as
 * a turn in place against a wall. A step that would push it further into a blocked
 * tile or the outside at a steeper angle is not taken: the robot keeps its pose, the bump
 * switch cuts the motors, and `bumped` is set for that step. Without the slide, the lateral
 * drift that heading hold cannot see wedges a robot against a corridor wall for good.
 *
 * Gyro: rate = (1 + scale)·ω + bias + white noise, the bias a random walk. The robot's own
 * heading estimate integrates (rate − estimated bias) while it moves; while it is at rest
 * it integrates nothing and learns the bias instead (zero-rate calibration at standstill,
 * common practice for MEMS gyros), so heading error grows only while moving.
 *
 * Departures from a fuller model: no wheel inertia beyond the acceleration limit, no lateral
 * tyre slip, the bicycle's reference point (rear axle) is also the footprint's centre, a
 * slide keeps the heading (no torque from the wall), and GLANCE_RAD (30°) is our choice,
 * not a measured figure.
 * References: CHECKS.md "Drive kinematics" (differential drive and kinematic bicycle, via
 * lib/kinematics); Gauss–Markov noise and gyro error terms as in Groves, "Principles of
 * GNSS, Inertial, and Multisensor Integrated Navigation Systems" (2nd ed.), ch. 4, from memory.
 */
import type { Floorplan } from "../lib/floorplan";
import { isFreeTile } from "../lib/floorplan";
import { wrapRadians } from "../lib/control";
import { bicycleDrive, differentialDrive, integrateArc, type Pose } from "../lib/kinematics";
import type { Drive } from "../lib/vocabulary";
import type { Rng } from "./rng";

export type Wheel = "left" | "right";

export interface DifferentialParams {
  kind: "differential";
  /** Distance between the wheels' contact points, metres. */
  trackM: number;
  maxWheelMS: number;
  wheelAccelMS2: number;
  /** Ground travel per counted travel, minus 1, per wheel (e.g. 0.01: 1 % farther than counted). */
  biasLeft: number;
  biasRight: number;
}

export interface BicycleParams {
  kind: "bicycle";
  /** Rear axle to front (steered) axle, metres. */
  wheelbaseM: number;
  maxSpeedMS: number;
  accelMS2: number;
  maxSteerRad: number;
  steerRateRadS: number;
  /** Ground travel per counted travel of the driven rear wheel, minus 1. */
  biasRear: number;
  /** Steering misalignment added to every steering angle, radians (positive steers left). */
  steerBiasRad: number;
}

export interface GyroParams {
  /** White rate noise density, rad/s/√Hz (per-sample σ = density/√dtS). */
  noiseDensity: number;
  /** Initial true bias, rad/s. */
  biasRadS: number;
  /** Bias random walk, rad/s per √s. */
  biasWalk: number;
  /** Scale-factor error, fraction (0.002 reads 0.2 % high). */
  scaleError: number;
  /** Time constant of the at-rest bias learning, seconds. */
  biasLearnTauS: number;
}

export interface PlantParams {
  drive: DifferentialParams | BicycleParams;
  /** Radius of the disc footprint, metres. */
  footprintRadiusM: number;
  /** Wheel slip: stationary standard deviation (fraction of speed) and correlation time (s). */
  slip: { sigma: number; tauS: number };
  gyro: GyroParams;
  /** Battery drain per second of charge fraction: at rest, and extra at full wheel speed. */
  battery: { idleDrainPerS: number; movingDrainPerS: number };
}

export type DriveCommand = { kind: "differential"; leftMS: number; rightMS: number } | { kind: "bicycle"; speedMS: number; steerRad: number };

export type Actuators = { kind: "differential"; leftMS: number; rightMS: number } | { kind: "bicycle"; speedMS: number; steerRad: number };

/** Everything a simulated robot is, at one instant. Plain data: copying it forks the simulation. */
export interface SimState {
  readonly plan: Floorplan;
  readonly params: PlantParams;
  /** Simulated time, seconds. */
  timeS: number;
  /** True pose (see the module header for the frame). */
  pose: Pose;
  /** Actual wheel rotation speeds in m/s of counted travel (or rear speed and steering angle). */
  actuators: Actuators;
  /** Encoder totals, metres of counted travel; a bicycle counts its rear wheel in both. */
  encoderLeftM: number;
  encoderRightM: number;
  slipLeft: number;
  slipRight: number;
  gyroBiasRadS: number;
  /** Last gyro rate reading, rad/s. */
  gyroRateRadS: number;
  /** The robot's own heading estimate from the gyro (radians, same convention as θ) and its bias estimate. */
  estimate: { headingRad: number; biasRadS: number };
  /** Charge fraction 0..1; at 0 the motors stop. */
  battery: number;
  stall: { wheel: Wheel; untilS: number } | null;
  /** True when the last step was refused by a collision. */
  bumped: boolean;
  bumps: number;
}

/** Tessera's demo robot: a small two-wheel base (13 cm track) or a cart (16 cm wheelbase) on tiles of tileM metres. */
export function defaultPlantParams(drive: Drive, tileM: number): PlantParams {
  const common = {
    footprintRadiusM: 0.34 * tileM,
    slip: { sigma: 0.02, tauS: 0.4 },
    gyro: { noiseDensity: 0.0003, biasRadS: 0.002, biasWalk: 0.0001, scaleError: 0.001, biasLearnTauS: 3 },
    battery: { idleDrainPerS: 1 / (12 * 3600), movingDrainPerS: 1 / (3 * 3600) },
  };
  if (drive === "bicycle") {
    return {
      ...common,
      drive: { kind: "bicycle", wheelbaseM: 0.16, maxSpeedMS: 0.35, accelMS2: 0.8, maxSteerRad: 0.65, steerRateRadS: 2.5, biasRear: 0.004, steerBiasRad: 0.015 },
    };
  }
  return { ...common, drive: { kind: "differential", trackM: 0.13, maxWheelMS: 0.35, wheelAccelMS2: 1.2, biasLeft: 0.006, biasRight: -0.006 } };
}

/**
 * Per-robot manufacturing spread around defaultPlantParams, drawn from rng: wheel diameter
 * errors σ 0.6 % per wheel, gyro bias σ 0.003 rad/s and scale error σ 0.2 %, steering
 * misalignment σ 0.015 rad (Tessera's demo values, not from a source).
 */
export function samplePlantParams(drive: Drive, tileM: number, rng: Rng): PlantParams {
  const base = defaultPlantParams(drive, tileM);
  const gyro = { ...base.gyro, biasRadS: 0.003 * rng.gaussian(), scaleError: 0.002 * rng.gaussian() };
  if (base.drive.kind === "differential") {
    return { ...base, gyro, drive: { ...base.drive, biasLeft: 0.006 * rng.gaussian(), biasRight: 0.006 * rng.gaussian() } };
  }
  return { ...base, gyro, drive: { ...base.drive, biasRear: 0.006 * rng.gaussian(), steerBiasRad: 0.015 * rng.gaussian() } };
}

/** Heading index 0..3 (N, E, S, W) to θ in radians. */
export function headingTheta(heading: number): number {
  return wrapRadians(Math.PI / 2 - (heading * Math.PI) / 2);
}

/** θ in radians to the nearest heading index 0..3 (N, E, S, W). */
export function thetaHeading(theta: number): number {
  const steps = Math.round((Math.PI / 2 - theta) / (Math.PI / 2));
  return ((steps % 4) + 4) % 4;
}

/** The tile a pose stands on; may lie outside the plan. */
export function poseTile(plan: Pick<Floorplan, "tileM">, pose: Pick<Pose, "x" | "y">): { row: number; col: number } {
  return { row: Math.floor(pose.y / plan.tileM), col: Math.floor(pose.x / plan.tileM) };
}

/** The pose at the centre of tile (row, col) facing heading index 0..3. */
export function tileCentrePose(plan: Pick<Floorplan, "tileM">, row: number, col: number, heading: number): Pose {
  return { x: (col + 0.5) * plan.tileM, y: (row + 0.5) * plan.tileM, theta: headingTheta(heading) };
}

/** How far a wall is into the footprint and the unit normal pushing the footprint out of it (null when nothing blocked is near). */
interface FootprintContact {
  depthM: number;
  normal: { x: number; y: number } | null;
}

function footprintContact(plan: Floorplan, x: number, y: number, radiusM: number): FootprintContact {
  const t = plan.tileM;
  const r0 = Math.floor((y - radiusM) / t);
  const r1 = Math.floor((y + radiusM) / t);
  const c0 = Math.floor((x - radiusM) / t);
  const c1 = Math.floor((x + radiusM) / t);
  const contact: FootprintContact = { depthM: -radiusM, normal: null };
  for (let r = r0; r <= r1; r++) {
    for (let c = c0; c <= c1; c++) {
      if (isFreeTile(plan, r, c)) continue;
      const nearX = Math.min(Math.max(x, c * t), (c + 1) * t);
      const nearY = Math.min(Math.max(y, r * t), (r + 1) * t);
      const gap = Math.hypot(x - nearX, y - nearY);
      if (radiusM - gap > contact.depthM) {
        contact.depthM = radiusM - gap;
        contact.normal = gap > 1e-12 ? { x: (x - nearX) / gap, y: (y - nearY) / gap } : null;
      }
    }
  }
  return contact;
}

/**
 * Depth in metres by which a disc of radius r at (x, y) overlaps blocked tiles or the outside
 * (≤ 0 when clear: minus the clearance to the nearest such tile within reach).
 */
export function footprintPenetrationM(plan: Floorplan, x: number, y: number, radiusM: number): number {
  return footprintContact(plan, x, y, radiusM).depthM;
}

/** Steepest angle between the motion and a wall at which the body slides along it rather than bumping. */
const GLANCE_RAD = Math.PI / 6;
/** Below this speed a contact is a scrub, not a bump: a robot turning in place against a wall (its centre wandering by wheel bias) rubs its bumper along it. */
const SCRUB_MS = 0.01;

/**
 * Where a step from `from` towards `to` ends: `to` when clear; slid along a wall met at a
 * glancing angle (or scrubbed along it), by pushing the pose back out along the contact
 * normal until it is no deeper than before, which for a flat wall drops exactly the motion
 * into it and also holds at a tile's corner; or null for a bump.
 */
function resolveContact(plan: Floorplan, radiusM: number, from: Pose, to: Pose, dtS: number): Pose | null {
  const depthBefore = footprintPenetrationM(plan, from.x, from.y, radiusM);
  const allowed = Math.max(depthBefore, 0);
  const pushesIn = (depth: number) => depth > 1e-9 && depth > depthBefore + 1e-12;
  const after = footprintContact(plan, to.x, to.y, radiusM);
  if (!pushesIn(after.depthM)) return to;
  const length = Math.hypot(to.x - from.x, to.y - from.y);
  const n = after.normal;
  if (!n || length === 0) return null;
  const excess = after.depthM - allowed;
  if (excess > length * Math.sin(GLANCE_RAD) && length >= SCRUB_MS * dtS) return null;
  const slid = { x: to.x + excess * n.x, y: to.y + excess * n.y, theta: to.theta };
  return pushesIn(footprintPenetrationM(plan, slid.x, slid.y, radiusM)) ? null : slid;
}

/** A robot at rest at the centre of a free tile; throws RangeError when the tile is blocked or outside (programmer error). */
export function createSimState(plan: Floorplan, params: PlantParams, start: { row: number; col: number; heading: number }, battery = 1): SimState {
  if (!isFreeTile(plan, start.row, start.col)) throw new RangeError(`createSimState: tile (${start.row}, ${start.col}) is not free`);
  if (!(battery >= 0 && battery <= 1)) throw new RangeError("createSimState: battery must lie in [0, 1]");
  const pose = tileCentrePose(plan, start.row, start.col, start.heading);
  return {
    plan,
    params,
    timeS: 0,
    pose,
    actuators: params.drive.kind === "differential" ? { kind: "differential", leftMS: 0, rightMS: 0 } : { kind: "bicycle", speedMS: 0, steerRad: 0 },
    encoderLeftM: 0,
    encoderRightM: 0,
    slipLeft: 0,
    slipRight: 0,
    gyroBiasRadS: params.gyro.biasRadS,
    gyroRateRadS: 0,
    // Calibrated at power-up: the robot starts knowing its bias and placed facing its start heading.
    estimate: { headingRad: pose.theta, biasRadS: params.gyro.biasRadS },
    battery,
    stall: null,
    bumped: false,
    bumps: 0,
  };
}

/** The command that stops the given drive. */
export function stopCommand(drive: Drive): DriveCommand {
  return drive === "differential" ? { kind: "differential", leftMS: 0, rightMS: 0 } : { kind: "bicycle", speedMS: 0, steerRad: 0 };
}

const clamp = (value: number, limit: number) => (value > limit ? limit : value < -limit ? -limit : value);
const approach = (current: number, target: number, maxStep: number) => current + clamp(target - current, maxStep);
const AT_REST_MS = 1e-6;

/**
 * Advances the plant by dtS seconds (> 0) under `command`, drawing noise from `rng`; returns a new state
 * (the input is not changed). Throws RangeError on a non-positive step or a command for the other drive.
 */
export function stepRobot(state: SimState, command: DriveCommand, dtS: number, rng: Rng): SimState {
  if (!(dtS > 0) || !Number.isFinite(dtS)) throw new RangeError("stepRobot: dtS must be positive and finite");
  const { params, plan } = state;
  const drive = params.drive;
  if (command.kind !== drive.kind) throw new RangeError(`stepRobot: ${command.kind} command for a ${drive.kind} robot`);
  const powered = state.battery > 0;
  const stall = state.stall && state.timeS < state.stall.untilS ? state.stall : null;

  const decay = Math.exp(-dtS / params.slip.tauS);
  const innovation = params.slip.sigma * Math.sqrt(1 - decay * decay);
  const slipLeft = decay * state.slipLeft + innovation * rng.gaussian();
  const slipRight = decay * state.slipRight + innovation * rng.gaussian();

  let actuators: Actuators;
  let countedLeftM: number;
  let countedRightM: number;
  let v: number;
  let omega: number;
  let speedFraction: number;
  if (drive.kind === "differential" && command.kind === "differential" && state.actuators.kind === "differential") {
    const maxStep = drive.wheelAccelMS2 * dtS;
    let left = approach(state.actuators.leftMS, powered ? clamp(command.leftMS, drive.maxWheelMS) : 0, maxStep);
    let right = approach(state.actuators.rightMS, powered ? clamp(command.rightMS, drive.maxWheelMS) : 0, maxStep);
    if (stall?.wheel === "left") left = 0;
    if (stall?.wheel === "right") right = 0;
    actuators = { kind: "differential", leftMS: left, rightMS: right };
    countedLeftM = left * dtS;
    countedRightM = right * dtS;
    const body = differentialDrive({ vl: left * (1 + drive.biasLeft) * (1 + slipLeft), vr: right * (1 + drive.biasRight) * (1 + slipRight), track: drive.trackM });
    v = body.v;
    omega = body.omega;
    speedFraction = (Math.abs(left) + Math.abs(right)) / (2 * drive.maxWheelMS);
  } else if (drive.kind === "bicycle" && command.kind === "bicycle" && state.actuators.kind === "bicycle") {
    let speed = approach(state.actuators.speedMS, powered ? clamp(command.speedMS, drive.maxSpeedMS) : 0, drive.accelMS2 * dtS);
    if (stall) speed = 0;
    const steer = approach(state.actuators.steerRad, clamp(command.steerRad, drive.maxSteerRad), drive.steerRateRadS * dtS);
    actuators = { kind: "bicycle", speedMS: speed, steerRad: steer };
    countedLeftM = countedRightM = speed * dtS;
    const body = bicycleDrive({ v: speed * (1 + drive.biasRear) * (1 + slipLeft), steer: steer + drive.steerBiasRad, wheelbase: drive.wheelbaseM });
    v = body.v;
    omega = body.omega;
    speedFraction = Math.abs(speed) / drive.maxSpeedMS;
  } else {
    throw new RangeError("stepRobot: actuator state does not match the drive");
  }

  const moved = integrateArc({ x: state.pose.x, y: -state.pose.y, theta: state.pose.theta }, v, omega, dtS);
  let pose: Pose = { x: moved.x, y: -moved.y, theta: moved.theta };
  const resolved = resolveContact(plan, params.footprintRadiusM, state.pose, pose, dtS);
  let bumped = false;
  if (resolved) {
    pose = resolved;
  } else {
    bumped = true;
    pose = state.pose;
    omega = 0;
    actuators = actuators.kind === "differential" ? { kind: "differential", leftMS: 0, rightMS: 0 } : { kind: "bicycle", speedMS: 0, steerRad: actuators.steerRad };
  }

  const gyro = params.gyro;
  const gyroBiasRadS = state.gyroBiasRadS + gyro.biasWalk * Math.sqrt(dtS) * rng.gaussian();
  const gyroRateRadS = (1 + gyro.scaleError) * omega + gyroBiasRadS + (gyro.noiseDensity / Math.sqrt(dtS)) * rng.gaussian();
  const atRest = Math.abs(countedLeftM) + Math.abs(countedRightM) <= AT_REST_MS * dtS && !bumped;
  let estimate: SimState["estimate"];
  if (atRest) {
    const gain = Math.min(1, dtS / gyro.biasLearnTauS);
    estimate = { headingRad: state.estimate.headingRad, biasRadS: state.estimate.biasRadS + gain * (gyroRateRadS - state.estimate.biasRadS) };
  } else {
    estimate = { headingRad: wrapRadians(state.estimate.headingRad + (gyroRateRadS - state.estimate.biasRadS) * dtS), biasRadS: state.estimate.biasRadS };
  }

  const drain = params.battery.idleDrainPerS + params.battery.movingDrainPerS * Math.min(1, speedFraction);
  const timeS = state.timeS + dtS;
  return {
    plan,
    params,
    timeS,
    pose,
    actuators,
    encoderLeftM: state.encoderLeftM + countedLeftM,
    encoderRightM: state.encoderRightM + countedRightM,
    slipLeft,
    slipRight,
    gyroBiasRadS,
    gyroRateRadS,
    estimate,
    battery: Math.max(0, state.battery - drain * dtS),
    stall: stall && timeS < stall.untilS ? stall : null,
    bumped,
    bumps: state.bumps + (bumped ? 1 : 0),
  };
}

export type FaultResult = { ok: true; state: SimState } | { ok: false; reason: string };

/** Kidnap: the robot is carried to the centre of a free tile, facing `heading` (default: its tile heading); it does not notice. */
export function kidnapRobot(state: SimState, to: { row: number; col: number; heading?: number }): FaultResult {
  if (!isFreeTile(state.plan, to.row, to.col)) return { ok: false, reason: `tile (${to.row}, ${to.col}) is blocked or outside the plan` };
  const heading = to.heading ?? thetaHeading(state.pose.theta);
  const stopped: Actuators = state.actuators.kind === "differential" ? { kind: "differential", leftMS: 0, rightMS: 0 } : { kind: "bicycle", speedMS: 0, steerRad: 0 };
  return { ok: true, state: { ...state, pose: tileCentrePose(state.plan, to.row, to.col, heading), actuators: stopped } };
}

/** Jams one wheel (for a bicycle: the drive) for `seconds` of simulated time from now. */
export function stallWheel(state: SimState, wheel: Wheel, seconds: number): FaultResult {
  if (!(seconds > 0) || !Number.isFinite(seconds)) return { ok: false, reason: "stall seconds must be positive" };
  return { ok: true, state: { ...state, stall: { wheel, untilS: state.timeS + seconds } } };
}

/** Drains the battery to `level` (default 5 %) at once; it keeps draining normally afterwards. */
export function drainBattery(state: SimState, level = 0.05): FaultResult {
  if (!(level >= 0 && level <= 1)) return { ok: false, reason: "battery level must lie in [0, 1]" };
  return { ok: true, state: { ...state, battery: Math.min(state.battery, level) } };
}
