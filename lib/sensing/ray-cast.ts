/**
 * Expected ranges z* for Tessera's range sensors: a ray from the centre of a
 * tile at the absolute angle heading + bearing to the first blocked tile or
 * the edge of the plan, capped at the sensor's maximum range, precomputed for
 * every (state, sensor) of a plan.
 *
 * Assumes point sensors at the tile centre and a zero-width beam, as the beam
 * model's ray casting does (Probabilistic Robotics §6.3); the grid traversal
 * is Amanatides and Woo, "A Fast Voxel Traversal Algorithm for Ray Tracing"
 * (Eurographics 1987). Departure: a ray that passes exactly through a tile
 * corner (diagonal bearings) stops there if any of the three tiles meeting it
 * ahead is blocked, since a real beam has width and would not slip through.
 *
 * The table stores z* per state as Float32 metres, and, for speed, the rank of
 * each z* among the sensor's distinct values (a Uint16 bin): from a tile
 * centre the ray meets grid lines at (k + ½)/|cos φ| or (k + ½)/|sin φ| tiles,
 * so a sensor has only about 2·maxRange/tileM distinct values, and a reading's
 * likelihood needs one beam evaluation per distinct value, not per state.
 */
import type { Floorplan } from "../floorplan/types";
import { isFreeTile, stateCount } from "../floorplan/types";
import type { SensorSpec } from "./model";

type RangeSpec = Extract<SensorSpec, { kind: "range" }>;

export interface RangeTable {
  states: number;
  /** The plan's range sensors, in the order given. */
  sensors: RangeSpec[];
  /** Per sensor: z* in metres for each state (0 on blocked tiles). */
  expectedM: Float32Array[];
  /** Per sensor: for each state, the index of its z* in levelsM. */
  bin: Uint16Array[];
  /** Per sensor: the distinct z* values in metres. */
  levelsM: Float64Array[];
}

const TIE = 1e-9;
const NEAR_ZERO = 1e-12;

/** Absolute direction of a sensor in radians, counter-clockwise from east (+col), for heading index 0..3 (N, E, S, W). */
export function beamAngleRad(heading: number, bearingDeg: number): number {
  return ((90 - 90 * heading + bearingDeg) * Math.PI) / 180;
}

/**
 * Distance in metres from the centre of tile (row, col) along angleRad (counter-clockwise from +col, rows grow downward)
 * to the first blocked tile or the plan's edge, capped at maxRangeM.
 */
export function castRay(plan: Floorplan, row: number, col: number, angleRad: number, maxRangeM: number): number {
  let dx = Math.cos(angleRad);
  let dy = -Math.sin(angleRad);
  if (Math.abs(dx) < NEAR_ZERO) dx = 0;
  if (Math.abs(dy) < NEAR_ZERO) dy = 0;
  const maxT = maxRangeM / plan.tileM;
  const stepX = dx > 0 ? 1 : -1;
  const stepY = dy > 0 ? 1 : -1;
  const deltaX = dx === 0 ? Infinity : 1 / Math.abs(dx);
  const deltaY = dy === 0 ? Infinity : 1 / Math.abs(dy);
  let tx = dx === 0 ? Infinity : 0.5 * deltaX;
  let ty = dy === 0 ? Infinity : 0.5 * deltaY;
  let c = col;
  let r = row;
  for (;;) {
    const t = Math.min(tx, ty);
    if (t >= maxT) return maxRangeM;
    if (Math.abs(tx - ty) <= TIE * t) {
      const hit = !isFreeTile(plan, r, c + stepX) || !isFreeTile(plan, r + stepY, c) || !isFreeTile(plan, r + stepY, c + stepX);
      if (hit) return t * plan.tileM;
      c += stepX;
      r += stepY;
      tx += deltaX;
      ty += deltaY;
    } else if (tx < ty) {
      c += stepX;
      tx += deltaX;
      if (!isFreeTile(plan, r, c)) return t * plan.tileM;
    } else {
      r += stepY;
      ty += deltaY;
      if (!isFreeTile(plan, r, c)) return t * plan.tileM;
    }
  }
}

/** Expected ranges of every range sensor in `sensors` (floor sensors skipped) for every free state of `plan`; throws RangeError on a bad sensor. */
export function buildRangeTable(plan: Floorplan, sensors: readonly SensorSpec[]): RangeTable {
  const states = stateCount(plan);
  const ranged = sensors.filter((s): s is RangeSpec => s.kind === "range");
  const table: RangeTable = { states, sensors: ranged, expectedM: [], bin: [], levelsM: [] };
  for (const sensor of ranged) {
    if (!(sensor.maxRangeM > 0) || !Number.isFinite(sensor.maxRangeM)) throw new RangeError(`sensor ${sensor.id}: maxRangeM must be positive`);
    if (!Number.isFinite(sensor.bearingDeg)) throw new RangeError(`sensor ${sensor.id}: bearingDeg must be finite`);
    const expected = new Float32Array(states);
    const bin = new Uint16Array(states);
    const levelIndex = new Map<number, number>();
    const levels: number[] = [];
    const angles = [0, 1, 2, 3].map((h) => beamAngleRad(h, sensor.bearingDeg));
    for (let r = 0; r < plan.rows; r++) {
      for (let c = 0; c < plan.cols; c++) {
        if (plan.blocked[r * plan.cols + c] !== 0) continue;
        for (let h = 0; h < 4; h++) {
          const s = (r * plan.cols + c) * 4 + h;
          const z = Math.fround(castRay(plan, r, c, angles[h], sensor.maxRangeM));
          expected[s] = z;
          let level = levelIndex.get(z);
          if (level === undefined) {
            level = levels.length;
            if (level > 0xffff) throw new RangeError(`sensor ${sensor.id}: more than 65536 distinct expected ranges`);
            levelIndex.set(z, level);
            levels.push(z);
          }
          bin[s] = level;
        }
      }
    }
    table.expectedM.push(expected);
    table.bin.push(bin);
    table.levelsM.push(Float64Array.from(levels));
  }
  return table;
}

/** Bytes held by a range table's typed arrays. */
export function rangeTableBytes(table: RangeTable): number {
  let bytes = 0;
  for (let k = 0; k < table.sensors.length; k++) bytes += table.expectedM[k].byteLength + table.bin[k].byteLength + table.levelsM[k].byteLength;
  return bytes;
}
