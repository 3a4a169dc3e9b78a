/**
 * One robot's histogram filter with everything precomputed: the transition
 * table, the expected-range table, the mixing floor and the plan's mark
 * classes, plus two preallocated belief buffers that are swapped on every
 * update. This is what the fleet service holds per robot; the pure functions
 * motionUpdate and senseUpdate give the same numbers (checked in the tests).
 *
 * Assumes the filter's own belief stays normalised between calls, so the
 * motion step needs no extra pass to normalise its input. The tables depend
 * only on (plan, model) and (plan, sensors), so robots that share them may
 * pass them in via opts instead of building their own.
 * Reference: Probabilistic Robotics (2005) §4.1, the discrete Bayes filter.
 */
import type { Floorplan } from "../floorplan/types";
import { stateCount } from "../floorplan/types";
import type { MotionModel } from "../motion/model";
import type { TransitionTable } from "../motion/transitions";
import { buildTransitions } from "../motion/transitions";
import { actionIndex, applyTransitions } from "../motion/update";
import type { SensorModel, SensorReading, SensorSpec } from "../sensing/model";
import type { RangeTable } from "../sensing/ray-cast";
import { buildRangeTable } from "../sensing/ray-cast";
import type { ReadingFactor, SenseOutcome } from "../sensing/update";
import { correctInto, markClasses, readingFactors } from "../sensing/update";
import type { Action } from "../vocabulary";
import type { Certainty } from "./belief";
import { certainty, uniformBelief } from "./belief";
import { fillFreeStates, freeStateCount } from "./normalise";

export interface FilterOptions {
  /** A table from buildTransitions(plan, model), shared between robots. */
  table?: TransitionTable;
  /** A table from buildRangeTable(plan, sensors), shared between robots. */
  ranges?: RangeTable;
  /** Uniform floor blended in when nothing explains a message (default 0.05), as in senseUpdate. */
  fallbackMix?: number;
}

export interface Filter {
  readonly plan: Floorplan;
  readonly model: MotionModel;
  readonly sensors: readonly SensorSpec[];
  readonly sensorModel: SensorModel;
  readonly table: TransitionTable;
  readonly ranges: RangeTable;
  /** The current normalised belief; the filter overwrites this buffer on later updates, so copy it to keep it. */
  readonly belief: Float64Array;
  /** Replaces the belief (blocked states zeroed, then normalised); uniform when omitted. Throws RangeError on a wrong length or no mass. */
  reset(belief?: ArrayLike<number>): void;
  /** Applies one tile action (prediction step, with mixing). */
  motion(action: Action | number): void;
  /** Applies one message's readings (correction step). */
  sense(readings: readonly SensorReading[]): SenseOutcome;
  /** motion then sense, the step cycle of the robot link. */
  step(action: Action | number, readings: readonly SensorReading[]): SenseOutcome;
  /** Certainty figures of the current belief. */
  certainty(): Certainty;
}

const MIN_MASS = 1e-290;

/** Multiplies prior by every factor into out in one pass and returns the total; factors are range (bin per state) or floor (mark per tile). */
function fusedCorrect(plan: Floorplan, prior: Float64Array, factors: readonly ReadingFactor[], out: Float64Array): number {
  const states = prior.length;
  const ranged = factors.filter((f) => f.bin !== undefined);
  const floors = factors.filter((f) => f.bin === undefined);
  let sum = 0;
  if (ranged.length === 3 && floors.length === 0) {
    const [f0, f1, f2] = ranged.map((f) => f.factor);
    const [b0, b1, b2] = ranged.map((f) => f.bin as Uint16Array);
    for (let s = 0; s < states; s++) {
      const v = prior[s] * f0[b0[s]] * f1[b1[s]] * f2[b2[s]];
      out[s] = v;
      sum += v;
    }
    return sum;
  }
  out.set(prior);
  const mark = plan.mark;
  for (const f of floors) {
    const factor = f.factor;
    for (let s = 0; s < states; s++) out[s] *= factor[mark[s >> 2]];
  }
  for (const f of ranged) {
    const factor = f.factor;
    const bin = f.bin as Uint16Array;
    for (let s = 0; s < states; s++) out[s] *= factor[bin[s]];
  }
  for (let s = 0; s < states; s++) sum += out[s];
  return sum;
}

/** A filter for one robot on `plan`, starting from the uniform belief; tables are built unless given in opts. */
export function createFilter(plan: Floorplan, model: MotionModel, sensors: readonly SensorSpec[], sensorModel: SensorModel, opts: FilterOptions = {}): Filter {
  const states = stateCount(plan);
  const table = opts.table ?? buildTransitions(plan, model);
  const ranges = opts.ranges ?? buildRangeTable(plan, sensors);
  if (table.states !== states || ranges.states !== states) throw new RangeError("tables were built for another plan");
  const fallbackMix = opts.fallbackMix ?? 0.05;
  const freeStates = freeStateCount(plan);
  const mixFloor = fillFreeStates(plan, new Float64Array(states), model.mix / freeStates);
  const keep = 1 - model.mix;
  const classes = markClasses(plan);
  let current: Float64Array = uniformBelief(plan);
  let spare: Float64Array = new Float64Array(states);
  const scratch = new Float64Array(states);

  const swap = (): void => {
    const t = current;
    current = spare;
    spare = t;
  };

  const motion = (action: Action | number): void => {
    const a = actionIndex(action);
    spare.set(mixFloor);
    applyTransitions(table, current, a, keep, spare);
    swap();
  };

  const sense = (readings: readonly SensorReading[]): SenseOutcome => {
    const { factors, ignored } = readingFactors(plan, readings, sensors, sensorModel, ranges, classes);
    if (factors.length === 0) return { fellBack: false, ignored };
    const sum = fusedCorrect(plan, current, factors, spare);
    if (sum > MIN_MASS && Number.isFinite(sum)) {
      const inv = 1 / sum;
      for (let s = 0; s < states; s++) spare[s] *= inv;
      swap();
      return { fellBack: false, ignored };
    }
    const fellBack = correctInto(plan, current, factors, spare, fallbackMix, scratch);
    swap();
    return { fellBack, ignored };
  };

  return {
    plan,
    model,
    sensors,
    sensorModel,
    table,
    ranges,
    get belief() {
      return current;
    },
    reset(belief?: ArrayLike<number>) {
      if (belief === undefined) {
        current.set(uniformBelief(plan));
        return;
      }
      if (belief.length !== states) throw new RangeError(`belief has ${belief.length} entries, plan has ${states} states`);
      let sum = 0;
      for (let s = 0; s < states; s++) {
        const v = plan.blocked[s >> 2] === 0 ? belief[s] : 0;
        spare[s] = v;
        sum += v;
      }
      if (!(sum > 0) || !Number.isFinite(sum)) throw new RangeError("belief has no positive finite mass on free states");
      for (let s = 0; s < states; s++) current[s] = spare[s] / sum;
    },
    motion,
    sense,
    step(action, readings) {
      motion(action);
      return sense(readings);
    },
    certainty() {
      return certainty(plan, current);
    },
  };
}
