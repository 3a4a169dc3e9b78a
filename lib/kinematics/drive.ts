/**
 * Body velocities of Tessera's two drive kinds and the exact pose update for constant controls.
 *
 * Differential drive: v = (vr + vl)/2, ω = (vr − vl)/track, counter-clockwise positive.
 * Kinematic bicycle: rear-axle reference θ̇ = v·tan δ / L, or centre-of-gravity reference with
 * slip angle β = atan(lr·tan δ / L) and θ̇ = v·cos β·tan δ / L.
 * Assumes rolling without slip and |δ| < π/2. Departure from the textbook: a straight-line motion
 * reports radius null instead of an infinite radius, so no Infinity reaches callers; the pose
 * update uses the sinc form of the arc so ω → 0 needs no special division.
 * References: Siegwart, Nourbakhsh and Scaramuzza, "Introduction to Autonomous Mobile Robots"
 * (2nd ed.), §3.2 (differential drive); Rajamani, "Vehicle Dynamics and Control" (2nd ed.),
 * §2.2 (kinematic bicycle, CG slip angle); both as summarised in CHECKS.md.
 */

/** A planar pose: x, y in metres, theta in radians, counter-clockwise from the x axis. */
export interface Pose {
  x: number;
  y: number;
  theta: number;
}

/** Body velocity: v in m/s along the heading, omega in rad/s, radius of the path in metres (null when straight). */
export interface BodyVelocity {
  v: number;
  omega: number;
  radius: number | null;
}

const STRAIGHT_EPS = 1e-12;

function assertFinite(name: string, values: number[]): void {
  if (!values.every(Number.isFinite)) throw new RangeError(`${name}: inputs must be finite`);
}

/** Differential drive from wheel speeds vl, vr (m/s) and track width (m, > 0); radius is signed, positive to the left. */
export function differentialDrive(input: { vl: number; vr: number; track: number }): BodyVelocity {
  const { vl, vr, track } = input;
  assertFinite("differentialDrive", [vl, vr, track]);
  if (!(track > 0)) throw new RangeError("differentialDrive: track must be positive");
  const v = (vr + vl) / 2;
  const omega = (vr - vl) / track;
  const radius = Math.abs(vr - vl) <= STRAIGHT_EPS * Math.max(1, Math.abs(vr) + Math.abs(vl)) ? null : v / omega;
  return { v, omega, radius };
}

/** Kinematic bicycle about the rear axle: speed v (m/s), steer δ (rad, |δ| < π/2), wheelbase L (m, > 0). */
export function bicycleDrive(input: { v: number; steer: number; wheelbase: number }): BodyVelocity {
  const { v, steer, wheelbase } = input;
  assertFinite("bicycleDrive", [v, steer, wheelbase]);
  if (!(wheelbase > 0)) throw new RangeError("bicycleDrive: wheelbase must be positive");
  if (Math.abs(steer) >= Math.PI / 2) throw new RangeError("bicycleDrive: |steer| must be below π/2");
  const tanSteer = Math.tan(steer);
  const omega = (v * tanSteer) / wheelbase;
  const radius = Math.abs(tanSteer) <= STRAIGHT_EPS ? null : wheelbase / tanSteer;
  return { v, omega, radius };
}

/**
 * Kinematic bicycle about the centre of gravity, lr metres ahead of the rear axle (0 ≤ lr ≤ L).
 * beta is the slip angle (rad) between the CG velocity and the heading; radius is the CG's path radius.
 */
export function bicycleDriveCg(input: { v: number; steer: number; wheelbase: number; lr: number }): BodyVelocity & { beta: number } {
  const { v, steer, wheelbase, lr } = input;
  assertFinite("bicycleDriveCg", [v, steer, wheelbase, lr]);
  if (!(wheelbase > 0)) throw new RangeError("bicycleDriveCg: wheelbase must be positive");
  if (lr < 0 || lr > wheelbase) throw new RangeError("bicycleDriveCg: lr must lie within [0, wheelbase]");
  if (Math.abs(steer) >= Math.PI / 2) throw new RangeError("bicycleDriveCg: |steer| must be below π/2");
  const tanSteer = Math.tan(steer);
  const beta = Math.atan((lr * tanSteer) / wheelbase);
  const omega = (v * Math.cos(beta) * tanSteer) / wheelbase;
  const radius = Math.abs(tanSteer) <= STRAIGHT_EPS ? null : wheelbase / (Math.cos(beta) * tanSteer);
  return { v, omega, radius, beta };
}

/** sin(u)/u, with its Taylor series near 0 where the quotient loses precision. */
function sinc(u: number): number {
  if (Math.abs(u) < 1e-4) {
    const u2 = u * u;
    return 1 - u2 / 6 + (u2 * u2) / 120;
  }
  return Math.sin(u) / u;
}

/**
 * Exact pose after dtS seconds of constant speed v (m/s) and turn rate omega (rad/s): a circular arc,
 * or a straight line as omega → 0. Theta is returned wrapped into (−π, π].
 */
export function integrateArc(pose: Pose, v: number, omega: number, dtS: number): Pose {
  assertFinite("integrateArc", [pose.x, pose.y, pose.theta, v, omega, dtS]);
  const turn = omega * dtS;
  // Chord of the arc: length v·dt·sinc(turn/2), pointing along the mean heading.
  const chord = v * dtS * sinc(turn / 2);
  const mid = pose.theta + turn / 2;
  const rawTheta = pose.theta + turn;
  const full = 2 * Math.PI;
  let theta = rawTheta - full * Math.floor((rawTheta + Math.PI) / full);
  if (theta <= -Math.PI) theta += full;
  return { x: pose.x + chord * Math.cos(mid), y: pose.y + chord * Math.sin(mid), theta };
}
