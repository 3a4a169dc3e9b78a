/**
 * The histogram filter's correction step for Tessera: multiply the belief by
 * the likelihood of every reading of one `sensed` message and normalise,
 * Probabilistic Robotics (2005) §2.4.1 and §4.1, with the beam model of §6.3
 * for range readings (readings of one message are taken as independent given
 * the state, as the book does for the beams of a scan).
 *
 * Floor sensor: a confusion model over the K mark classes present on the
 * plan's free tiles (plain floor, class 0, counts as a class when some free
 * tile is plain): the true class is read with probability `hit`, each of the
 * other K − 1 classes with (1 − hit)/(K − 1). A reading of a class that no
 * free tile has carries no information about the state and is ignored.
 *
 * Speed: each reading is turned into a small table, its likelihood per
 * distinct expected range (see ray-cast.ts), rescaled so that its largest
 * entry is 1 (a constant factor the normalisation removes, which keeps long
 * products away from underflow); the per-state pass is then a table look-up
 * and a multiply.
 *
 * Departure from the textbook: when nothing can explain the readings (the
 * posterior mass is 0 or underflows), the prior is first blended with a
 * uniform floor over free states (opts.fallbackMix, default 0.05) and the
 * readings applied again; if even that has no mass the readings are dropped.
 * Either way the result says `fellBack: true`. Readings of unknown sensors,
 * of the wrong kind, or with a NaN or negative range are ignored and listed.
 */
import { fillFreeStates, freeStateCount } from "../belief/normalise";
import type { Floorplan } from "../floorplan/types";
import { stateCount } from "../floorplan/types";
import { beamLikelihood } from "./beam";
import type { SensorModel, SensorReading, SensorSpec } from "./model";
import { defaultSensorModel } from "./model";
import type { RangeTable } from "./ray-cast";
import { buildRangeTable } from "./ray-cast";

export interface SenseUpdateOptions {
  /** Buffer for the result (length stateCount; may be the input belief, which is then updated in place). */
  out?: Float64Array;
  /** A table from buildRangeTable for this plan and these sensors; built on the spot when omitted (slow). */
  ranges?: RangeTable;
  /** Weight in (0, 1] of the uniform floor blended into the prior when nothing explains the readings (default 0.05). */
  fallbackMix?: number;
}

export interface SenseOutcome {
  /** True when the readings could not be explained and the mixing floor was used. */
  fellBack: boolean;
  /** Sensor ids of readings that were ignored (unknown sensor, wrong kind, NaN or negative range, mark absent from the plan). */
  ignored: string[];
}

export interface SenseResult extends SenseOutcome {
  belief: Float64Array;
}

/** Below this total mass the posterior is treated as unexplained (well above Float64 underflow). */
const MIN_MASS = 1e-290;

/** A reading turned into a per-state likelihood: factor[key[s]] (key = bin of z* or the tile's mark class). */
export interface ReadingFactor {
  kind: "range" | "floor";
  /** Likelihood per key, rescaled so that the largest is 1. */
  factor: Float64Array;
  /** Range readings: the bin per state; floor readings: undefined (the key is plan.mark of the state's tile). */
  bin?: Uint16Array;
}

/** Classes present on free tiles, as a 256-entry 0/1 mask, and their count K. */
export function markClasses(plan: Floorplan): { present: Uint8Array; count: number } {
  const present = new Uint8Array(256);
  let count = 0;
  for (let t = 0; t < plan.blocked.length; t++) {
    if (plan.blocked[t] !== 0) continue;
    const m = plan.mark[t];
    if (present[m] === 0) {
      present[m] = 1;
      count++;
    }
  }
  return { present, count };
}

/** p(reading class `mark` | true class) for each true class 0..255 of the confusion model; undefined when `mark` is absent from the plan. */
export function floorLikelihoods(plan: Floorplan, mark: number, hit: number, classes = markClasses(plan)): Float64Array | undefined {
  if (!Number.isInteger(mark) || mark < 0 || mark > 255 || classes.present[mark] === 0) return undefined;
  const factor = new Float64Array(256);
  const miss = classes.count > 1 ? (1 - hit) / (classes.count - 1) : 0;
  for (let m = 0; m < 256; m++) if (classes.present[m] !== 0) factor[m] = m === mark ? hit : miss;
  return factor;
}

function rescaleToMax(factor: Float64Array): void {
  let max = 0;
  for (let i = 0; i < factor.length; i++) if (factor[i] > max) max = factor[i];
  if (max > 0 && Number.isFinite(max)) for (let i = 0; i < factor.length; i++) factor[i] /= max;
}

/** Turns one message's readings into likelihood factors; readings that cannot be used are listed in `ignored`. */
export function readingFactors(
  plan: Floorplan,
  readings: readonly SensorReading[],
  sensors: readonly SensorSpec[],
  model: SensorModel,
  ranges: RangeTable,
  classes = markClasses(plan),
): { factors: ReadingFactor[]; ignored: string[] } {
  const factors: ReadingFactor[] = [];
  const ignored: string[] = [];
  for (const reading of readings) {
    const sensor = sensors.find((s) => s.id === reading.sensor);
    if (sensor?.kind === "range" && "rangeM" in reading && !Number.isNaN(reading.rangeM) && reading.rangeM >= 0) {
      const k = ranges.sensors.findIndex((s) => s.id === sensor.id);
      if (k < 0) throw new RangeError(`range table has no sensor ${sensor.id}`);
      const levels = ranges.levelsM[k];
      const factor = new Float64Array(levels.length);
      for (let j = 0; j < levels.length; j++) factor[j] = beamLikelihood(reading.rangeM, levels[j], sensor.maxRangeM, model.range);
      rescaleToMax(factor);
      factors.push({ kind: "range", factor, bin: ranges.bin[k] });
    } else if (sensor?.kind === "floor" && "mark" in reading) {
      const factor = floorLikelihoods(plan, reading.mark, model.floor.hit, classes);
      if (factor === undefined) {
        ignored.push(reading.sensor);
        continue;
      }
      rescaleToMax(factor);
      factors.push({ kind: "floor", factor });
    } else {
      ignored.push(reading.sensor);
    }
  }
  return { factors, ignored };
}

/** Multiplies `out` (already holding the prior) by every factor; returns the total mass after. */
export function applyFactors(plan: Floorplan, factors: readonly ReadingFactor[], out: Float64Array): number {
  const states = out.length;
  for (const f of factors) {
    const factor = f.factor;
    if (f.bin !== undefined) {
      const bin = f.bin;
      for (let s = 0; s < states; s++) out[s] *= factor[bin[s]];
    } else {
      const mark = plan.mark;
      for (let t = 0, s = 0; s < states; t++, s += 4) {
        const l = factor[mark[t]];
        out[s] *= l;
        out[s + 1] *= l;
        out[s + 2] *= l;
        out[s + 3] *= l;
      }
    }
  }
  let sum = 0;
  for (let s = 0; s < states; s++) sum += out[s];
  return sum;
}

/** Copies `prior` into `out` and applies the factors, falling back to the mixing floor when nothing explains them; `out` ends normalised. */
export function correctInto(plan: Floorplan, prior: ArrayLike<number>, factors: readonly ReadingFactor[], out: Float64Array, fallbackMix: number, scratch?: Float64Array): boolean {
  const states = out.length;
  const saved = scratch ?? new Float64Array(states);
  let priorSum = 0;
  for (let s = 0; s < states; s++) {
    const v = prior[s];
    saved[s] = v;
    priorSum += v;
  }
  if (!(priorSum > 0) || !Number.isFinite(priorSum)) throw new RangeError("belief has no positive finite mass");
  out.set(saved);
  let sum = applyFactors(plan, factors, out);
  let fellBack = false;
  if (!(sum > MIN_MASS) || !Number.isFinite(sum)) {
    fellBack = true;
    const freeStates = freeStateCount(plan);
    fillFreeStates(plan, out, fallbackMix / freeStates);
    const keep = (1 - fallbackMix) / priorSum;
    for (let s = 0; s < states; s++) saved[s] = out[s] + keep * saved[s];
    out.set(saved);
    sum = applyFactors(plan, factors, out);
    if (!(sum > MIN_MASS) || !Number.isFinite(sum)) {
      out.set(saved);
      sum = 1;
    }
  }
  const inv = 1 / sum;
  for (let s = 0; s < states; s++) out[s] *= inv;
  return fellBack;
}

/** Posterior after one message, with whether the mixing floor was needed and which readings were ignored. */
export function senseUpdateDetailed(
  plan: Floorplan,
  belief: ArrayLike<number>,
  readings: readonly SensorReading[],
  sensors: readonly SensorSpec[],
  model: SensorModel = defaultSensorModel(),
  opts: SenseUpdateOptions = {},
): SenseResult {
  const states = stateCount(plan);
  if (belief.length !== states) throw new RangeError(`belief has ${belief.length} entries, plan has ${states} states`);
  const fallbackMix = opts.fallbackMix ?? 0.05;
  if (!(fallbackMix > 0 && fallbackMix <= 1)) throw new RangeError("fallbackMix must be in (0, 1]");
  const ranges = opts.ranges ?? buildRangeTable(plan, sensors);
  if (ranges.states !== states) throw new RangeError("range table was built for another plan");
  const out = opts.out ?? new Float64Array(states);
  if (out.length !== states) throw new RangeError("out has the wrong length");
  const { factors, ignored } = readingFactors(plan, readings, sensors, model, ranges);
  const fellBack = correctInto(plan, belief, factors, out, fallbackMix);
  return { belief: out, fellBack, ignored };
}

/** Posterior after one message: a new normalised Float64Array (or opts.out), zero on blocked tiles. */
export function senseUpdate(
  plan: Floorplan,
  belief: ArrayLike<number>,
  readings: readonly SensorReading[],
  sensors: readonly SensorSpec[],
  model: SensorModel = defaultSensorModel(),
  opts: SenseUpdateOptions = {},
): Float64Array {
  return senseUpdateDetailed(plan, belief, readings, sensors, model, opts).belief;
}
