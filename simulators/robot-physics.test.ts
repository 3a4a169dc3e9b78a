import { describe, expect, it } from "vitest";
import { emptyFloorplan, parseFloorplan } from "../lib/floorplan";
import { integrateArc } from "../lib/kinematics";
import {
  createSimState,
  defaultPlantParams,
  drainBattery,
  footprintPenetrationM,
  headingTheta,
  kidnapRobot,
  poseTile,
  stallWheel,
  stepRobot,
  thetaHeading,
  tileCentrePose,
  type DriveCommand,
  type PlantParams,
  type SimState,
} from "./robot-physics";
import { createRng } from "./rng";

/** A plant without noise, bias or actuator lag: what remains is the kinematics. */
function idealPlant(base: PlantParams): PlantParams {
  const drive =
    base.drive.kind === "differential"
      ? { ...base.drive, maxWheelMS: 100, wheelAccelMS2: 1e9, biasLeft: 0, biasRight: 0 }
      : { ...base.drive, maxSpeedMS: 100, accelMS2: 1e9, steerRateRadS: 1e9, maxSteerRad: 1.2, biasRear: 0, steerBiasRad: 0 };
  return { ...base, drive, slip: { sigma: 0, tauS: 1 }, gyro: { ...base.gyro, noiseDensity: 0, biasRadS: 0, biasWalk: 0, scaleError: 0 } };
}

function run(state: SimState, command: DriveCommand, steps: number, dtS: number, seed = 1): SimState {
  const rng = createRng(seed);
  let s = state;
  for (let i = 0; i < steps; i++) s = stepRobot(s, command, dtS, rng);
  return s;
}

describe("stepRobot kinematics", () => {
  it("differential drive follows v = (vr+vl)/2, ω = (vr−vl)/b on a circle of R 1.25 m and closes it after one turn", () => {
    // CHECKS.md "Drive kinematics": vl 0.4, vr 0.6, b 0.5 → v 0.5 m/s, ω 0.4 rad/s, R 1.25 m.
    const plan = emptyFloorplan(30, 30, 0.3048);
    const params = idealPlant(defaultPlantParams("differential", plan.tileM));
    const plant = { ...params, drive: { ...params.drive, trackM: 0.5 } } as PlantParams;
    const start = createSimState(plan, plant, { row: 15, col: 15, heading: 1 });
    const command: DriveCommand = { kind: "differential", leftMS: 0.4, rightMS: 0.6 };
    const dtS = 0.01;
    const one = stepRobot(start, command, dtS, createRng(3));
    const expected = integrateArc({ x: start.pose.x, y: -start.pose.y, theta: start.pose.theta }, 0.5, 0.4, dtS);
    expect(one.pose.x).toBeCloseTo(expected.x, 12);
    expect(one.pose.y).toBeCloseTo(-expected.y, 12);
    expect(one.pose.theta).toBeCloseTo(0.4 * dtS, 12);
    // Facing east and turning left (towards −y), the centre lies 1.25 m up the drawing.
    const centre = { x: start.pose.x, y: start.pose.y - 1.25 };
    let s = start;
    const periodSteps = Math.floor((2 * Math.PI) / 0.4 / dtS);
    for (let i = 0; i < periodSteps; i++) {
      s = stepRobot(s, command, dtS, createRng(i));
      expect(Math.hypot(s.pose.x - centre.x, s.pose.y - centre.y)).toBeCloseTo(1.25, 9);
    }
    const leftover = (2 * Math.PI) / 0.4 - periodSteps * dtS;
    s = stepRobot(s, command, leftover, createRng(0));
    expect(s.pose.x).toBeCloseTo(start.pose.x, 9);
    expect(s.pose.y).toBeCloseTo(start.pose.y, 9);
    expect(s.encoderLeftM).toBeCloseTo(0.4 * ((2 * Math.PI) / 0.4), 9);
    expect(s.encoderRightM).toBeCloseTo(0.6 * ((2 * Math.PI) / 0.4), 9);
  });

  it("bicycle drive turns at θ̇ = v·tan δ / L on a circle of R = L / tan δ", () => {
    // CHECKS.md: L 2.5, δ 0.2 rad, v 10 → R 12.3329 m, θ̇ 0.81084 rad/s.
    const plan = emptyFloorplan(40, 40, 1);
    const params = idealPlant(defaultPlantParams("bicycle", plan.tileM));
    const plant = { ...params, footprintRadiusM: 0.3, drive: { ...params.drive, wheelbaseM: 2.5 } } as PlantParams;
    const start = createSimState(plan, plant, { row: 33, col: 20, heading: 1 });
    // The steering actuator starts straight; one instant step brings it to 0.2 rad.
    const primed: SimState = { ...start, actuators: { kind: "bicycle", speedMS: 10, steerRad: 0.2 } };
    const command: DriveCommand = { kind: "bicycle", speedMS: 10, steerRad: 0.2 };
    const one = stepRobot(primed, command, 0.001, createRng(1));
    expect(one.pose.theta / 0.001).toBeCloseTo(0.81084, 4);
    const centre = { x: start.pose.x, y: start.pose.y - 12.3329 };
    const s = run(primed, command, 300, 0.005);
    expect(Math.hypot(s.pose.x - centre.x, s.pose.y - centre.y)).toBeCloseTo(12.3329, 3);
    expect(s.pose.theta).toBeCloseTo(0.81084 * 1.5, 3);
  });

  it("converts between heading indices, θ and tiles for every tile of a plan", () => {
    const plan = emptyFloorplan(5, 7, 0.25);
    for (let row = 0; row < plan.rows; row++) {
      for (let col = 0; col < plan.cols; col++) {
        for (let h = 0; h < 4; h++) {
          const pose = tileCentrePose(plan, row, col, h);
          expect(poseTile(plan, pose)).toEqual({ row, col });
          expect(thetaHeading(pose.theta)).toBe(h);
          expect(thetaHeading(pose.theta + 0.7)).toBe(h);
          expect(thetaHeading(pose.theta - 0.7)).toBe(h);
        }
      }
    }
    expect(headingTheta(0)).toBeCloseTo(Math.PI / 2, 12);
    expect(headingTheta(1)).toBe(0);
    expect(headingTheta(2)).toBeCloseTo(-Math.PI / 2, 12);
    expect(headingTheta(3)).toBeCloseTo(Math.PI, 12);
  });
});

describe("stepRobot physics", () => {
  const walled = parseFloorplan(["11111", "10001", "10001", "11111"].join("\n"));

  it("stops at a blocked tile: the footprint never enters it, the robot stays in its tile and counts a bump", () => {
    const state = createSimState(walled, defaultPlantParams("differential", walled.tileM), { row: 1, col: 3, heading: 1 });
    const rng = createRng(8);
    let s = state;
    let bumpedSteps = 0;
    for (let i = 0; i < 300; i++) {
      s = stepRobot(s, { kind: "differential", leftMS: 0.2, rightMS: 0.2 }, 0.01, rng);
      if (s.bumped) bumpedSteps += 1;
      expect(footprintPenetrationM(walled, s.pose.x, s.pose.y, s.params.footprintRadiusM)).toBeLessThanOrEqual(1e-9);
    }
    expect(poseTile(walled, s.pose)).toEqual({ row: 1, col: 3 });
    expect(bumpedSteps).toBeGreaterThan(0);
    expect(s.bumps).toBe(bumpedSteps);
  });

  it("slides along a wall it meets at a glancing angle, without a bump, and still bumps head-on past 30°", () => {
    // A corridor one tile high: the robot starts against its north wall, pointing 3° into it,
    // as lateral drift under heading hold leaves a robot after a few tiles.
    const corridor = parseFloorplan(["11111111", "10000001", "11111111"].join("\n"));
    const params = idealPlant(defaultPlantParams("differential", corridor.tileM));
    const r = params.footprintRadiusM;
    const along = (deg: number): SimState => {
      const start = createSimState(corridor, params, { row: 1, col: 1, heading: 1 });
      return { ...start, pose: { x: 1.5 * corridor.tileM, y: corridor.tileM + r + 1e-6, theta: (deg * Math.PI) / 180 } };
    };
    const forward: DriveCommand = { kind: "differential", leftMS: 0.2, rightMS: 0.2 };
    const slid = run(along(3), forward, 300, 0.01);
    expect(slid.bumps).toBe(0);
    expect(poseTile(corridor, slid.pose).col).toBeGreaterThanOrEqual(3);
    expect(footprintPenetrationM(corridor, slid.pose.x, slid.pose.y, r)).toBeLessThanOrEqual(1e-9);
    // The motion into the wall was dropped, so the centre kept its distance from the wall.
    expect(slid.pose.y).toBeCloseTo(corridor.tileM + r, 5);
    const steep = run(along(40), forward, 100, 0.01);
    expect(steep.bumps).toBeGreaterThan(0);
    expect(poseTile(corridor, steep.pose)).toEqual({ row: 1, col: 1 });
  });

  it("a stalled wheel stops counting for its seconds and turns again afterwards", () => {
    const plan = emptyFloorplan(20, 20);
    const base = createSimState(plan, defaultPlantParams("differential", plan.tileM), { row: 10, col: 10, heading: 0 });
    const stalled = stallWheel(base, "left", 0.5);
    expect(stalled.ok).toBe(true);
    if (!stalled.ok) return;
    const command: DriveCommand = { kind: "differential", leftMS: 0.05, rightMS: 0.05 };
    const during = run(stalled.state, command, 50, 0.01);
    expect(during.encoderLeftM).toBe(0);
    expect(during.encoderRightM).toBeGreaterThan(0.015);
    expect(during.pose.theta).toBeGreaterThan(base.pose.theta + 0.1);
    const after = run(during, command, 50, 0.01, 2);
    expect(after.stall).toBeNull();
    expect(after.encoderLeftM).toBeGreaterThan(0.015);
    expect(stallWheel(base, "right", 0)).toEqual({ ok: false, reason: "stall seconds must be positive" });
  });

  it("keeps the gyro heading estimate still at rest while it learns the bias, though the true bias drifts", () => {
    const plan = emptyFloorplan(6, 6);
    const params = defaultPlantParams("differential", plan.tileM);
    const state = createSimState(plan, { ...params, gyro: { ...params.gyro, biasRadS: 0.004, biasWalk: 0.0002 } }, { row: 2, col: 3, heading: 2 });
    const misCalibrated: SimState = { ...state, estimate: { ...state.estimate, biasRadS: 0.001 } };
    const s = run(misCalibrated, { kind: "differential", leftMS: 0, rightMS: 0 }, 3000, 0.01, 5);
    expect(s.estimate.headingRad).toBe(state.estimate.headingRad);
    expect(s.gyroBiasRadS).not.toBe(0.004);
    expect(Math.abs(s.estimate.biasRadS - s.gyroBiasRadS)).toBeLessThan(0.0006);
  });

  it("drains the battery slowly at rest, drains it at once as a fault, and stops the motors when it is empty", () => {
    const plan = emptyFloorplan(6, 6);
    const params = defaultPlantParams("differential", plan.tileM);
    const state = createSimState(plan, params, { row: 3, col: 2, heading: 1 });
    const idle = run(state, { kind: "differential", leftMS: 0, rightMS: 0 }, 10_000, 0.01);
    expect(idle.battery).toBeCloseTo(1 - 100 * params.battery.idleDrainPerS, 9);
    const drained = drainBattery(idle, 0.05);
    expect(drained.ok && drained.state.battery).toBe(0.05);
    const empty = { ...idle, battery: 0 };
    const after = run(empty, { kind: "differential", leftMS: 0.2, rightMS: 0.2 }, 100, 0.01);
    expect(after.pose).toEqual(empty.pose);
    expect(after.encoderLeftM).toBe(0);
  });

  it("a kidnap moves the true pose to the centre of the given tile and heading, and the robot's estimate does not notice", () => {
    const plan = emptyFloorplan(8, 9);
    const state = createSimState(plan, defaultPlantParams("differential", plan.tileM), { row: 1, col: 1, heading: 0 });
    const result = kidnapRobot(state, { row: 6, col: 7, heading: 3 });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(poseTile(plan, result.state.pose)).toEqual({ row: 6, col: 7 });
    expect(result.state.pose.x).toBeCloseTo(7.5 * plan.tileM, 12);
    expect(result.state.pose.y).toBeCloseTo(6.5 * plan.tileM, 12);
    expect(thetaHeading(result.state.pose.theta)).toBe(3);
    expect(result.state.estimate).toEqual(state.estimate);
    expect(kidnapRobot(state, { row: 8, col: 0 }).ok).toBe(false);
    expect(kidnapRobot(createSimState(walled, state.params, { row: 1, col: 1, heading: 0 }), { row: 0, col: 2 }).ok).toBe(false);
  });

  it("repeats exactly from the same seed over ten thousand steps, and differs with another seed", () => {
    const plan = emptyFloorplan(30, 30);
    const start = createSimState(plan, defaultPlantParams("differential", plan.tileM), { row: 15, col: 15, heading: 1 });
    const drive = (seed: number) => {
      const rng = createRng(seed);
      let s = start;
      for (let i = 0; i < 10_000; i++) {
        const phase = Math.floor(i / 500) % 4;
        const command: DriveCommand = { kind: "differential", leftMS: phase === 1 ? -0.1 : 0.15, rightMS: phase === 3 ? 0.05 : 0.15 };
        s = stepRobot(s, command, 0.01, rng);
      }
      return s;
    };
    const a = drive(42);
    const b = drive(42);
    const c = drive(43);
    expect(a).toEqual(b);
    expect(a.pose.x).not.toBe(c.pose.x);
    expect(a.timeS).toBeCloseTo(100, 9);
  });

  it("refuses programmer errors: a zero step, a command for the other drive, a start on a blocked tile", () => {
    const plan = emptyFloorplan(3, 3);
    const state = createSimState(plan, defaultPlantParams("differential", plan.tileM), { row: 1, col: 1, heading: 0 });
    expect(() => stepRobot(state, { kind: "differential", leftMS: 0, rightMS: 0 }, 0, createRng(1))).toThrow(RangeError);
    expect(() => stepRobot(state, { kind: "bicycle", speedMS: 0.1, steerRad: 0 }, 0.01, createRng(1))).toThrow(RangeError);
    expect(() => createSimState(walled, state.params, { row: 0, col: 0, heading: 0 })).toThrow(RangeError);
  });
});
