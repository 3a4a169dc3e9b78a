/**
 * Tessera's sensor descriptions, readings and sensor-model parameters, as the
 * robot link (PROTOCOL.md) carries them: range sensors at a bearing relative
 * to the robot's heading (positive to the left), and a floor-mark sensor.
 *
 * The default parameters are Tessera's starting values for hobby ultrasonic
 * rangers on one-foot tiles (a few centimetres of noise, some short echoes
 * from people and clutter); they are not taken from a source and are tuned per
 * robot in the roster. Reference for the parameter meanings: Thrun, Burgard
 * and Fox, Probabilistic Robotics (2005), §6.3 (beam model).
 */

/** A sensor as announced in `hello`: a range finder (bearing in degrees, counter-clockwise from the heading; maximum range in metres) or a floor-mark reader. */
export type SensorSpec = { id: string; kind: "range"; bearingDeg: number; maxRangeM: number } | { id: string; kind: "floor" };
/** One reading of a `sensed` message: a range in metres (≥ maxRangeM means no echo) or a floor mark class (0 = plain floor). */
export type SensorReading = { sensor: string; rangeM: number } | { sensor: string; mark: number };
/** Alias of SensorSpec under the contract's name. */
export type Sensor = SensorSpec;
/** Alias of SensorReading under the contract's name. */
export type Reading = SensorReading;

export interface BeamParams {
  /** Standard deviation of a correct echo, metres (> 0). */
  sigmaM: number;
  /** Rate of the exponential short-echo term, per metre (> 0). */
  lambdaShort: number;
  /** Mixture weights, non-negative, summing to 1. */
  weights: { hit: number; short: number; max: number; rand: number };
}

export interface SensorModel {
  range: BeamParams;
  /** Probability in (0, 1] that the floor sensor reads the true mark class. */
  floor: { hit: number };
}

/** Default sensor model: σ 4 cm, λ 0.8 /m, weights hit 0.75 short 0.1 max 0.05 rand 0.1; floor hit 0.9. */
export function defaultSensorModel(): SensorModel {
  return {
    range: { sigmaM: 0.04, lambdaShort: 0.8, weights: { hit: 0.75, short: 0.1, max: 0.05, rand: 0.1 } },
    floor: { hit: 0.9 },
  };
}
