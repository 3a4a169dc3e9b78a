/**
 * The heading controller's default gains, shared by the roster (what a robot starts with
 * and what "reset" restores) and the simulator's on-board loop.
 *
 * The loop's output is a turn rate in rad/s from a heading error in radians. The numbers
 * were picked by hand on the simulator's plant (simulators/robot-physics.ts) and are a
 * starting point for a real base, not a source's values; CHECKS.md "PID" gives the
 * Ziegler–Nichols rules (zieglerNichols in pid.ts) for tuning one on site.
 */

/** Parallel-form PID gains: kp per rad of error, ki per rad·s, kd per rad/s. */
export interface HeadingGains {
  kp: number;
  ki: number;
  kd: number;
}

/** Default heading-hold gains: kp 6, ki 1.5, kd 0.05. */
export function defaultHeadingGains(): HeadingGains {
  return { kp: 6, ki: 1.5, kd: 0.05 };
}
