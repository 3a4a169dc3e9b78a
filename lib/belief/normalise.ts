/**
 * Normalisation helpers shared by Tessera's belief code: sums, in-place
 * normalisation, and counting the free (tile, heading) states of a plan.
 *
 * Assumes beliefs are non-negative arrays indexed by stateIndex; blocked tiles
 * hold 0. No reference needed: a probability vector divided by its sum.
 */
import type { Floorplan } from "../floorplan/types";

/** Sum of all entries (a probability mass; 1 for a normalised belief). */
export function beliefSum(belief: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < belief.length; i++) sum += belief[i];
  return sum;
}

/** Divides `belief` by its sum in place and returns the sum before; leaves it untouched and returns the sum when the sum is not a positive finite number. */
export function normaliseInPlace(belief: Float64Array | Float32Array): number {
  const sum = beliefSum(belief);
  if (!(sum > 0) || !Number.isFinite(sum)) return sum;
  const inv = 1 / sum;
  for (let i = 0; i < belief.length; i++) belief[i] *= inv;
  return sum;
}

/** A normalised Float64 copy of `belief`; throws RangeError when it has no positive finite mass (a programmer error). */
export function normalised(belief: ArrayLike<number>): Float64Array {
  const out = Float64Array.from(belief);
  const sum = normaliseInPlace(out);
  if (!(sum > 0) || !Number.isFinite(sum)) throw new RangeError("belief has no positive finite mass");
  return out;
}

/** Number of free (tile, heading) states: 4 × the free tiles of the plan. */
export function freeStateCount(plan: Floorplan): number {
  let free = 0;
  for (let i = 0; i < plan.blocked.length; i++) if (plan.blocked[i] === 0) free++;
  return free * 4;
}

/** Fills `out` with `value` on free states and 0 on blocked ones (the mixing floor's shape). */
export function fillFreeStates(plan: Floorplan, out: Float64Array, value: number): Float64Array {
  const tiles = plan.rows * plan.cols;
  for (let t = 0; t < tiles; t++) {
    const v = plan.blocked[t] === 0 ? value : 0;
    const s = t * 4;
    out[s] = v;
    out[s + 1] = v;
    out[s + 2] = v;
    out[s + 3] = v;
  }
  return out;
}
