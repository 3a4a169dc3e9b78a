import { describe, expect, it } from "vitest";
import { parseFloorplan } from "../lib/floorplan";
import { beamAngleRad, castRay } from "../lib/sensing";
import { createSimState, defaultPlantParams, type SimState } from "./robot-physics";
import { createRng } from "./rng";
import { defaultSensorParams, rayDistanceM, readFloor, readRange, readSensors, speedOfSoundMS, truthOf } from "./sim-sensors";

// A hand-made 6 × 8 room: a pillar at (2, 4), a stub wall at (4, 2), tile side 0.5 m.
const ROOM = ["11111111", "10000001", "10001001", "10000001", "10100001", "11111111"].join("\n");
const room = parseFloorplan(ROOM, { tileM: 0.5 });
const marked = parseFloorplan(`${ROOM}\n---\n........\n.2......\n......3.\n........\n........\n........`, { tileM: 0.5 });

function robotAt(plan = room, x: number, y: number, theta: number): SimState {
  const state = createSimState(plan, defaultPlantParams("differential", plan.tileM), { row: 1, col: 1, heading: 0 });
  return { ...state, pose: { x, y, theta } };
}

describe("rayDistanceM", () => {
  it("agrees with lib/sensing's castRay from every tile centre, heading and bearing", () => {
    for (let row = 1; row < room.rows - 1; row++) {
      for (let col = 1; col < room.cols - 1; col++) {
        if (room.blocked[row * room.cols + col]) continue;
        for (let heading = 0; heading < 4; heading++) {
          for (const bearing of [0, 90, -90, 45, -30, 180]) {
            const angle = beamAngleRad(heading, bearing);
            const expected = castRay(room, row, col, angle, 3);
            expect(rayDistanceM(room, (col + 0.5) * 0.5, (row + 0.5) * 0.5, angle, 3)).toBeCloseTo(expected, 9);
          }
        }
      }
    }
  });

  it("measures from an off-centre point to the walls and the pillar, by hand", () => {
    // At x 1.10, y 1.30 (row 2, col 2): the pillar's west face is at x 2.0, the east wall at 3.5,
    // the north wall's face at y 0.5, the stub wall (row 4, col 2) at y 2.0.
    expect(rayDistanceM(room, 1.1, 1.3, 0, 5)).toBeCloseTo(0.9, 12);
    expect(rayDistanceM(room, 1.1, 0.8, 0, 5)).toBeCloseTo(2.4, 12);
    expect(rayDistanceM(room, 1.1, 1.3, Math.PI / 2, 5)).toBeCloseTo(0.8, 12);
    expect(rayDistanceM(room, 1.1, 1.3, -Math.PI / 2, 5)).toBeCloseTo(0.7, 12);
    expect(rayDistanceM(room, 1.1, 1.3, Math.PI, 5)).toBeCloseTo(0.6, 12);
    expect(rayDistanceM(room, 1.1, 1.3, 0, 0.5)).toBe(0.5);
    expect(rayDistanceM(room, 0.2, 0.2, 0, 5)).toBe(0);
  });
});

describe("speed of sound", () => {
  it("is about 343 m/s at 20 °C and 331.3 m/s at 0 °C", () => {
    // CHECKS.md "Ultrasonic ranging": c = 331.3·√(1 + θ/273.15), about 343 m/s at 20 °C (±1 m/s).
    expect(Math.abs(speedOfSoundMS(20) - 343)).toBeLessThan(1);
    expect(speedOfSoundMS(0)).toBe(331.3);
    expect(speedOfSoundMS(35)).toBeGreaterThan(speedOfSoundMS(20));
  });
});

describe("readRange", () => {
  const sensor = { id: "us-front", kind: "range" as const, bearingDeg: 0, maxRangeM: 3 };
  const left = { id: "us-left", kind: "range" as const, bearingDeg: 90, maxRangeM: 3 };

  it("matches the ray-cast distance within the noise, with a few missed and short echoes", () => {
    const params = defaultSensorParams();
    const rng = createRng(2024);
    const state = robotAt(room, 1.1, 1.3, 0);
    const reads = Array.from({ length: 4000 }, () => readRange(state, sensor, params, rng));
    const missed = reads.filter((r) => r === 3).length / reads.length;
    const hits = reads.filter((r) => Math.abs(r - 0.9) < 5 * params.rangeSigmaM);
    const short = reads.filter((r) => r < 0.9 - 5 * params.rangeSigmaM).length / reads.length;
    const hitMean = hits.reduce((a, b) => a + b, 0) / hits.length;
    const hitSd = Math.sqrt(hits.reduce((a, b) => a + (b - hitMean) ** 2, 0) / hits.length);
    expect(Math.abs(hitMean - 0.9)).toBeLessThan(0.002);
    expect(hitSd).toBeGreaterThan(0.8 * params.rangeSigmaM);
    expect(hitSd).toBeLessThan(1.2 * params.rangeSigmaM);
    expect(missed).toBeGreaterThan(0.015);
    expect(missed).toBeLessThan(0.045);
    expect(short).toBeGreaterThan(0.008);
    expect(short).toBeLessThan(0.035);
    expect(reads.every((r) => r >= params.minRangeM && r <= 3)).toBe(true);
  });

  it("turns the bearing counter-clockwise from the heading (positive to the left)", () => {
    const quiet = { ...defaultSensorParams(), rangeSigmaM: 0, missProb: 0, shortProb: 0 };
    // Facing east at x 1.1, y 1.3: left is north, 0.8 m to the wall's face.
    expect(readRange(robotAt(room, 1.1, 1.3, 0), left, quiet, createRng(1))).toBe(0.8);
    // Facing south, left is east: 0.9 m to the pillar.
    expect(readRange(robotAt(room, 1.1, 1.3, -Math.PI / 2), left, quiet, createRng(1))).toBe(0.9);
  });

  it("reads short in a room warmer than the ranger assumes, by the ratio of the speeds of sound", () => {
    const warm = { ...defaultSensorParams(), rangeSigmaM: 0, missProb: 0, shortProb: 0, airTempC: 35 };
    const read = readRange(robotAt(room, 1.1, 0.8, 0), sensor, warm, createRng(1));
    expect(read).toBeCloseTo(Math.round((2.4 * speedOfSoundMS(20)) / speedOfSoundMS(35) * 1000) / 1000, 9);
    expect(read).toBeLessThan(2.4 - 0.05);
  });

  it("reports no echo as maxRangeM when the wall is beyond reach", () => {
    const quiet = { ...defaultSensorParams(), rangeSigmaM: 0, missProb: 0, shortProb: 0 };
    expect(readRange(robotAt(room, 1.1, 0.8, 0), { ...sensor, maxRangeM: 2 }, quiet, createRng(1))).toBe(2);
  });
});

describe("readFloor", () => {
  it("reads the true tile's mark most of the time and another class otherwise", () => {
    const params = defaultSensorParams();
    const rng = createRng(99);
    const onMark = robotAt(marked, 0.7, 0.6, 0);
    const reads = Array.from({ length: 5000 }, () => readFloor(onMark, params, rng));
    const right = reads.filter((m) => m === 2).length / reads.length;
    expect(right).toBeGreaterThan(0.94);
    expect(right).toBeLessThan(0.98);
    expect(new Set(reads.filter((m) => m !== 2))).toEqual(new Set([0, 1, 3]));
    const plain = robotAt(marked, 1.7, 1.6, 0);
    const plainReads = Array.from({ length: 2000 }, () => readFloor(plain, params, rng));
    expect(plainReads.filter((m) => m === 0).length / plainReads.length).toBeGreaterThan(0.94);
  });
});

describe("readSensors and truthOf", () => {
  it("reads every sensor in order and gives the true tile and tile heading", () => {
    const sensors = [
      { id: "us-front", kind: "range" as const, bearingDeg: 0, maxRangeM: 3 },
      { id: "floor", kind: "floor" as const },
    ];
    const state = robotAt(marked, 3.2, 1.1, 0.3);
    const readings = readSensors(state, sensors, defaultSensorParams(), createRng(5));
    expect(readings.map((r) => r.sensor)).toEqual(["us-front", "floor"]);
    expect(readings[1]).toHaveProperty("mark");
    expect(truthOf(state)).toEqual({ row: 2, col: 6, heading: "E" });
    expect(truthOf({ ...state, pose: { x: 0.6, y: 2.4, theta: 2.6 } })).toEqual({ row: 4, col: 1, heading: "W" });
  });
});
