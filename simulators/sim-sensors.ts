/**
 * What a simulated robot's sensors read, from its true continuous pose.
 *
 * Ultrasonic ranging: a ray from the robot's reference point at θ + bearing (bearing
 * positive to the left) through the grid to the first blocked tile or the plan's edge
 * (Amanatides–Woo traversal from an arbitrary start point; a ray through a corner stops if
 * any tile meeting there ahead is blocked, as lib/sensing's castRay does). The echo's time of
 * flight is taken at the room's speed of sound and converted back at the speed the ranger
 * assumes, so a warm or cold room scales every reading. Then Gaussian noise; sometimes no
 * echo (reads maxRangeM), sometimes a short echo from a person in the beam (uniform between
 * the minimum range and the true one). Zero-width beam: a real 15–30° cone would return the
 * nearest echo in the cone (CHECKS.md), which Tessera's filter does not model either.
 *
 * Floor sensor: the mark class of the true tile, misread now and then as another class
 * that occurs on the plan (uniformly).
 * References: CHECKS.md "Ultrasonic ranging" (c = 331.3·√(1 + θ/273.15) m/s, range =
 * c·t/2); Amanatides and Woo, Eurographics 1987; Probabilistic Robotics §6.3 for the
 * kinds of range error (hit noise, short, max, from memory).
 */
import type { Floorplan } from "../lib/floorplan";
import { isFreeTile } from "../lib/floorplan";
import type { Reading, Sensor } from "../lib/sensing";
import { HEADINGS, type Heading } from "../lib/vocabulary";
import { poseTile, thetaHeading, type SimState } from "./robot-physics";
import type { Rng } from "./rng";

export interface SensorParams {
  /** Standard deviation of a correct echo, metres. */
  rangeSigmaM: number;
  /** Probability that a ping returns no echo. */
  missProb: number;
  /** Probability that something in the beam returns an early echo. */
  shortProb: number;
  /** Nearest range the ranger reports, metres. */
  minRangeM: number;
  /** Probability that the floor sensor reads a class other than the true one. */
  floorMisreadProb: number;
  /** Air temperature of the room, °C, and the temperature whose speed of sound the ranger assumes. */
  airTempC: number;
  assumedAirTempC: number;
}

/** Demo sensor settings: 2 cm noise, 3 % missed echoes, 2 % short echoes, 3 cm minimum range, 4 % floor misreads, 20 °C. */
export function defaultSensorParams(): SensorParams {
  return { rangeSigmaM: 0.02, missProb: 0.03, shortProb: 0.02, minRangeM: 0.03, floorMisreadProb: 0.04, airTempC: 20, assumedAirTempC: 20 };
}

/** Speed of sound in dry air at tempC degrees Celsius, m/s: 331.3·√(1 + tempC/273.15). */
export function speedOfSoundMS(tempC: number): number {
  if (!(tempC > -273.15)) throw new RangeError("speedOfSoundMS: temperature must lie above absolute zero");
  return 331.3 * Math.sqrt(1 + tempC / 273.15);
}

const TIE = 1e-9;

/**
 * Distance in metres from (x, y) (metres, y downward) along angleRad (counter-clockwise from +x as the floor is drawn)
 * to the first blocked tile or the plan's edge, capped at maxRangeM; 0 when the start lies in a blocked tile.
 */
export function rayDistanceM(plan: Floorplan, x: number, y: number, angleRad: number, maxRangeM: number): number {
  const px = x / plan.tileM;
  const py = y / plan.tileM;
  let col = Math.floor(px);
  let row = Math.floor(py);
  if (!isFreeTile(plan, row, col)) return 0;
  const dx = Math.abs(Math.cos(angleRad)) < 1e-12 ? 0 : Math.cos(angleRad);
  const dy = Math.abs(Math.sin(angleRad)) < 1e-12 ? 0 : -Math.sin(angleRad);
  const stepX = dx > 0 ? 1 : -1;
  const stepY = dy > 0 ? 1 : -1;
  const deltaX = dx === 0 ? Number.POSITIVE_INFINITY : 1 / Math.abs(dx);
  const deltaY = dy === 0 ? Number.POSITIVE_INFINITY : 1 / Math.abs(dy);
  let tx = dx === 0 ? Number.POSITIVE_INFINITY : (dx > 0 ? col + 1 - px : px - col) * deltaX;
  let ty = dy === 0 ? Number.POSITIVE_INFINITY : (dy > 0 ? row + 1 - py : py - row) * deltaY;
  const maxT = maxRangeM / plan.tileM;
  for (;;) {
    const t = Math.min(tx, ty);
    if (t >= maxT) return maxRangeM;
    if (Math.abs(tx - ty) <= TIE * Math.max(1, t)) {
      if (!isFreeTile(plan, row, col + stepX) || !isFreeTile(plan, row + stepY, col) || !isFreeTile(plan, row + stepY, col + stepX)) return t * plan.tileM;
      col += stepX;
      row += stepY;
      tx += deltaX;
      ty += deltaY;
    } else if (tx < ty) {
      col += stepX;
      tx += deltaX;
      if (!isFreeTile(plan, row, col)) return t * plan.tileM;
    } else {
      row += stepY;
      ty += deltaY;
      if (!isFreeTile(plan, row, col)) return t * plan.tileM;
    }
  }
}

/** One ultrasonic reading in metres, in [0, maxRangeM], rounded to the millimetre; maxRangeM means no echo. */
export function readRange(state: SimState, sensor: Extract<Sensor, { kind: "range" }>, params: SensorParams, rng: Rng): number {
  const angle = state.pose.theta + (sensor.bearingDeg * Math.PI) / 180;
  const trueM = rayDistanceM(state.plan, state.pose.x, state.pose.y, angle, sensor.maxRangeM);
  const draw = rng.uniform();
  const noise = rng.gaussian();
  const spot = rng.uniform();
  if (draw < params.missProb || trueM >= sensor.maxRangeM) return sensor.maxRangeM;
  let readM: number;
  if (draw < params.missProb + params.shortProb && trueM > params.minRangeM) {
    readM = params.minRangeM + spot * (trueM - params.minRangeM);
  } else {
    // The ranger times the echo at the room's speed of sound and converts it at the one it assumes.
    const echoS = (2 * trueM) / speedOfSoundMS(params.airTempC);
    readM = (speedOfSoundMS(params.assumedAirTempC) * echoS) / 2 + params.rangeSigmaM * noise;
  }
  const bounded = Math.min(sensor.maxRangeM, Math.max(params.minRangeM, readM));
  return Math.round(bounded * 1000) / 1000;
}

/** The floor sensor's mark class for the true tile (0 off the plan or on plain floor), misread with floorMisreadProb. */
export function readFloor(state: SimState, params: SensorParams, rng: Rng): number {
  const { plan } = state;
  const { row, col } = poseTile(plan, state.pose);
  const inside = row >= 0 && row < plan.rows && col >= 0 && col < plan.cols;
  const truth = inside ? plan.mark[row * plan.cols + col] : 0;
  const draw = rng.uniform();
  const pick = rng.uniform();
  if (draw >= params.floorMisreadProb) return truth;
  let classes = 1;
  for (let i = 0; i < plan.mark.length; i++) classes = Math.max(classes, plan.mark[i]);
  // Any class 0..max other than the truth, uniformly.
  const other = Math.min(classes - 1, Math.floor(pick * classes));
  return other >= truth ? other + 1 : other;
}

/** Readings of all `sensors`, in their order, as a `sensed` message carries them. */
export function readSensors(state: SimState, sensors: readonly Sensor[], params: SensorParams, rng: Rng): Reading[] {
  return sensors.map((sensor) => (sensor.kind === "range" ? { sensor: sensor.id, rangeM: readRange(state, sensor, params, rng) } : { sensor: sensor.id, mark: readFloor(state, params, rng) }));
}

/** The true tile and tile heading, as a `truth` message carries them. */
export function truthOf(state: SimState): { row: number; col: number; heading: Heading } {
  const { row, col } = poseTile(state.plan, state.pose);
  return { row, col, heading: HEADINGS[thetaHeading(state.pose.theta)] };
}
