/**
 * Discrete PID controller, heading wrap and Ziegler–Nichols tuning.
 *
 * Computes u = kp·e + ki·∫e dt + kd·de/dt in parallel (independent-gain) form with a
 * backward-Euler integral and a backward-difference derivative.
 * Assumes the caller samples at a positive interval dtS; a non-positive step only applies
 * the proportional and stored integral terms, so no division by zero can happen.
 * Departures from the textbook form: the derivative acts on the measurement when one is
 * given (no derivative kick on set-point changes), the first step has no derivative term,
 * and the integral is conditionally frozen while the output is saturated in the direction
 * of the error (anti-windup by conditional integration).
 * References: Åström and Hägglund, "Advanced PID Control" (2006), ch. 3 (derivative on
 * measurement, anti-windup), from memory; Ziegler and Nichols (1942), ultimate-gain table
 * as given in the design notes' CHECKS.md (shared/design/CHECKS.md beside this repository).
 */

/** Gains in output units per error unit (kp), per error·second (ki), per error/second (kd); limits bound the output. */
export interface PidConfig {
  kp: number;
  ki: number;
  kd: number;
  outMin?: number;
  outMax?: number;
}

/** A PID instance; its only state is the integral and the previous error/measurement. */
export interface Pid {
  /**
   * One control step: error = set-point − measurement, dtS > 0 in seconds. When `measurement`
   * is given the derivative is −kd·d(measurement)/dt, otherwise kd·d(error)/dt. Returns the clamped output.
   */
  step(error: number, dtS: number, measurement?: number): number;
  /** Forgets the integral and the derivative history. */
  reset(): void;
}

/** Creates a discrete PID with output limits [outMin, outMax] (default unbounded) and conditional-integration anti-windup. */
export function createPid(config: PidConfig): Pid {
  const { kp, ki, kd } = config;
  const outMin = config.outMin ?? -Number.MAX_VALUE;
  const outMax = config.outMax ?? Number.MAX_VALUE;
  if (![kp, ki, kd, outMin, outMax].every(Number.isFinite)) throw new RangeError("createPid: gains and limits must be finite");
  if (outMin > outMax) throw new RangeError("createPid: outMin must not exceed outMax");

  let integral = 0;
  let previous = 0;
  let hasPrevious = false;

  const clamp = (u: number) => (u < outMin ? outMin : u > outMax ? outMax : u);

  return {
    step(error, dtS, measurement) {
      if (!Number.isFinite(error) || !Number.isFinite(dtS)) throw new RangeError("createPid.step: error and dtS must be finite");
      if (measurement !== undefined && !Number.isFinite(measurement)) throw new RangeError("createPid.step: measurement must be finite");
      const tracked = measurement ?? error;
      if (dtS <= 0) return clamp(kp * error + ki * integral);

      const derivative = hasPrevious ? (measurement === undefined ? 1 : -1) * kd * ((tracked - previous) / dtS) : 0;
      previous = tracked;
      hasPrevious = true;

      const candidate = integral + error * dtS;
      const unclamped = kp * error + ki * candidate + derivative;
      // Integrate only when that does not push an already saturated output further out.
      const saturatedHigh = unclamped > outMax && ki * error > 0;
      const saturatedLow = unclamped < outMin && ki * error < 0;
      if (!saturatedHigh && !saturatedLow) integral = candidate;
      return clamp(kp * error + ki * integral + derivative);
    },
    reset() {
      integral = 0;
      previous = 0;
      hasPrevious = false;
    },
  };
}

/** Wraps an angle in degrees into (−180, 180]; used on heading errors before the gain. */
export function wrapDegrees(deg: number): number {
  if (!Number.isFinite(deg)) throw new RangeError("wrapDegrees: angle must be finite");
  const wrapped = deg - 360 * Math.floor((deg + 180) / 360);
  return wrapped === -180 ? 180 : wrapped;
}

/** Wraps an angle in radians into (−π, π]. */
export function wrapRadians(rad: number): number {
  if (!Number.isFinite(rad)) throw new RangeError("wrapRadians: angle must be finite");
  const turn = 2 * Math.PI;
  const wrapped = rad - turn * Math.floor((rad + Math.PI) / turn);
  return wrapped <= -Math.PI ? wrapped + turn : wrapped;
}

export type ZieglerNicholsKind = "P" | "PI" | "PID";

/**
 * Ziegler–Nichols ultimate-gain tuning: ku is the gain at which a P loop oscillates steadily,
 * tuS that oscillation's period in seconds. Returns parallel-form gains (ki = kp/Ti, kd = kp·Td).
 */
export function zieglerNichols(ku: number, tuS: number, kind: ZieglerNicholsKind): { kp: number; ki: number; kd: number } {
  if (!(ku > 0) || !(tuS > 0) || !Number.isFinite(ku) || !Number.isFinite(tuS)) {
    throw new RangeError("zieglerNichols: ku and tuS must be positive and finite");
  }
  if (kind === "P") return { kp: 0.5 * ku, ki: 0, kd: 0 };
  if (kind === "PI") {
    const kp = 0.45 * ku;
    return { kp, ki: kp / (tuS / 1.2), kd: 0 };
  }
  const kp = 0.6 * ku;
  return { kp, ki: kp / (tuS / 2), kd: kp * (tuS / 8) };
}
