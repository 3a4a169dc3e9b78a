/**
 * Tessera's belief: a probability over every (tile, heading) state of a
 * floorplan, indexed by stateIndex, zero on blocked tiles, summing to 1.
 * Constructors (uniform, concentrated on a pose) and summaries (the tile
 * marginal and the certainty figures shown to operators).
 *
 * Assumes a plan with at least one free tile. Entropy is normalised by the
 * log of the number of free states so that 1 means "uniform, nothing known"
 * and 0 means "one state certain" on any plan size (Shannon entropy, Cover and
 * Thomas, Elements of Information Theory, §2.1; the normalisation is Tessera's).
 */
import type { Floorplan } from "../floorplan/types";
import { isFreeTile, stateCount } from "../floorplan/types";
import type { Heading } from "../vocabulary";
import { HEADINGS } from "../vocabulary";
import { fillFreeStates, freeStateCount } from "./normalise";

/** Uniform belief over the free states; throws RangeError when the plan has no free tile. */
export function uniformBelief(plan: Floorplan): Float64Array {
  const free = freeStateCount(plan);
  if (free === 0) throw new RangeError("plan has no free tile");
  return fillFreeStates(plan, new Float64Array(stateCount(plan)), 1 / free);
}

/** Heading index 0..3 from a heading name or index; throws RangeError otherwise. */
export function headingIndex(heading: Heading | number): number {
  const h = typeof heading === "number" ? heading : HEADINGS.indexOf(heading);
  if (!Number.isInteger(h) || h < 0 || h > 3) throw new RangeError(`unknown heading ${String(heading)}`);
  return h;
}

/**
 * Belief concentrated on a pose: weight 1 − d/(spread + 1) on free tiles at Euclidean tile distance d ≤ spread,
 * on the given heading or spread evenly over all four when it is omitted. Throws RangeError when the tile is blocked or outside.
 */
export function poseBelief(plan: Floorplan, pose: { row: number; col: number; heading?: Heading | number }, spread = 0): Float64Array {
  const { row, col } = pose;
  if (!isFreeTile(plan, row, col)) throw new RangeError(`tile (${row}, ${col}) is blocked or outside the plan`);
  if (!(spread >= 0) || !Number.isFinite(spread)) throw new RangeError("spread must be a non-negative number of tiles");
  const heading = pose.heading === undefined ? undefined : headingIndex(pose.heading);
  const belief = new Float64Array(stateCount(plan));
  const reach = Math.floor(spread);
  let sum = 0;
  for (let r = row - reach; r <= row + reach; r++) {
    for (let c = col - reach; c <= col + reach; c++) {
      const d = Math.hypot(r - row, c - col);
      if (d > spread || !isFreeTile(plan, r, c)) continue;
      const w = 1 - d / (spread + 1);
      const base = (r * plan.cols + c) * 4;
      if (heading === undefined) for (let h = 0; h < 4; h++) belief[base + h] = w / 4;
      else belief[base + heading] = w;
      sum += w;
    }
  }
  for (let s = 0; s < belief.length; s++) belief[s] /= sum;
  return belief;
}

/** Belief mass per tile (summed over headings), row-major, rows*cols entries. */
export function tileMarginal(plan: Floorplan, belief: ArrayLike<number>): Float32Array {
  const tiles = plan.rows * plan.cols;
  const out = new Float32Array(tiles);
  for (let t = 0; t < tiles; t++) out[t] = belief[4 * t] + belief[4 * t + 1] + belief[4 * t + 2] + belief[4 * t + 3];
  return out;
}

export interface Certainty {
  /** Tile and heading index (0..3) of the most likely state. */
  row: number;
  col: number;
  heading: number;
  /** Belief mass on that tile over all headings, in [0, 1]. */
  tileMass: number;
  /** Shannon entropy divided by log(number of free states), in [0, 1]; 0 when only one state is free. */
  entropy: number;
}

/** The most likely state, the mass on its tile, and the normalised entropy of a (normalised) belief. */
export function certainty(plan: Floorplan, belief: ArrayLike<number>): Certainty {
  let best = 0;
  let bestP = -1;
  let h = 0;
  let sum = 0;
  for (let s = 0; s < belief.length; s++) {
    const p = belief[s];
    sum += p;
    if (p > bestP) {
      bestP = p;
      best = s;
    }
    if (p > 0) h -= p * Math.log(p);
  }
  const free = freeStateCount(plan);
  // h was computed on the raw values; for a belief summing to `sum`, H = h/sum + log(sum).
  const entropyNats = sum > 0 ? h / sum + Math.log(sum) : 0;
  const entropy = free > 1 ? Math.min(1, Math.max(0, entropyNats / Math.log(free))) : 0;
  const tile = best >> 2;
  const tileMass = sum > 0 ? (belief[4 * tile] + belief[4 * tile + 1] + belief[4 * tile + 2] + belief[4 * tile + 3]) / sum : 0;
  return { row: Math.floor(tile / plan.cols), col: tile % plan.cols, heading: best & 3, tileMass, entropy };
}
