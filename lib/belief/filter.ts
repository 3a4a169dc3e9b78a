/**
 * One robot's histogram filter with everything precomputed: the transition
 * table, the expected-range table, the mixing floor and the plan's mark
 * classes, plus two preallocated belief buffers that are swapped on every
 * update. This is what the fleet service holds per robot; the pure functions
 * motionUpdate and senseUpdate give the same numbers (checked in the tests).
 *
 * Departs from the textbook's order of work, not its numbers: the prediction
 * is computed "pull" style (each state gathers from its few source states),
 * fused with the correction into one sequential pass, and the normalisation
 * is deferred to the next update (which divides by the prior's mass) or to
 * whoever reads `belief`. The transition and range tables depend only on
 * (plan, model) and (plan, sensors), so robots that share them may pass them
 * in via opts; the compressed pull tables and joint bins derived from them
 * are built per filter (a few bytes per state).
 * Reference: Probabilistic Robotics (2005) §4.1, the discrete Bayes filter.
 */
import type { Floorplan } from "../floorplan/types";
import { stateCount } from "../floorplan/types";
import type { MotionModel } from "../motion/model";
import type { TransitionTable } from "../motion/transitions";
import { buildTransitions } from "../motion/transitions";
import { actionIndex } from "../motion/update";
import type { SensorModel, SensorReading, SensorSpec } from "../sensing/model";
import type { RangeTable } from "../sensing/ray-cast";
import { buildRangeTable } from "../sensing/ray-cast";
import type { ReadingFactor, SenseOutcome } from "../sensing/update";
import { applyFactors, correctInto, markClasses, readingFactors } from "../sensing/update";
import type { Action } from "../vocabulary";
import type { Certainty } from "./belief";
import { certainty, uniformBelief } from "./belief";
import { freeStateCount } from "./normalise";

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
  /** motion then sense in one pass, the step cycle of the robot link. */
  step(action: Action | number, readings: readonly SensorReading[]): SenseOutcome;
  /** Certainty figures of the current belief. */
  certainty(): Certainty;
}

const MIN_MASS = 1e-290;
/** Incoming outcomes per (state, action): the models of motion/transitions.ts give at most three (self, one or two tiles behind, or the turn's source). */
const SLOTS = 3;

/**
 * The transition table turned around for one action and compressed: every target state t gets a pattern
 * code[t], and pattern p pulls from states t + delta[3p + k] with probability prob[3p + k] (already scaled by
 * 1 − mix, padded with probability 0) and adds the mixing floor floor[p]. Away from walls all states of one
 * heading share a pattern, so a plan has a few dozen patterns and the per-state data is two bytes.
 */
interface PullTable {
  code: Uint16Array;
  delta: Int32Array;
  prob: Float64Array;
  floor: Float64Array;
}

function compressPull(states: number, src: Int32Array, prob: Float64Array, floorOf: (t: number) => number): PullTable {
  const code = new Uint16Array(states);
  const ids = new Map<string, number>();
  const deltas: number[] = [];
  const probs: number[] = [];
  const floors: number[] = [];
  for (let t = 0; t < states; t++) {
    const j = t * SLOTS;
    const floor = floorOf(t);
    const key = `${floor}|${src[j] - t},${prob[j]}|${src[j + 1] - t},${prob[j + 1]}|${src[j + 2] - t},${prob[j + 2]}`;
    let id = ids.get(key);
    if (id === undefined) {
      id = floors.length;
      if (id > 0xffff) throw new RangeError("more than 65536 transition patterns");
      ids.set(key, id);
      floors.push(floor);
      for (let k = 0; k < SLOTS; k++) {
        deltas.push(src[j + k] - t);
        probs.push(prob[j + k]);
      }
    }
    code[t] = id;
  }
  return { code, delta: Int32Array.from(deltas), prob: Float64Array.from(probs), floor: Float64Array.from(floors) };
}

function buildPullTables(plan: Floorplan, table: TransitionTable, mix: number, mixFloor: number): PullTable[] {
  const states = table.states;
  const pulls: PullTable[] = [];
  for (let a = 0; a < 4; a++) {
    const src = new Int32Array(states * SLOTS);
    const prob = new Float64Array(states * SLOTS);
    const used = new Uint8Array(states);
    for (let t = 0; t < states; t++) src.fill(t, t * SLOTS, (t + 1) * SLOTS);
    for (let s = 0; s < states; s++) {
      for (let e = table.offsets[s * 4 + a]; e < table.offsets[s * 4 + a + 1]; e++) {
        const t = table.next[e];
        let k = 0;
        while (k < used[t] && src[t * SLOTS + k] !== s) k++;
        if (k === used[t]) {
          if (k === SLOTS) throw new RangeError(`state ${t} has more than ${SLOTS} source states under action ${a}`);
          used[t]++;
          src[t * SLOTS + k] = s;
        }
        prob[t * SLOTS + k] += (1 - mix) * table.prob[e];
      }
    }
    pulls.push(compressPull(states, src, prob, (t) => (plan.blocked[t >> 2] === 0 ? mixFloor : 0)));
  }
  return pulls;
}

/** The identity as a pull table without mixing (the correction step alone). */
function identityPull(plan: Floorplan, states: number): PullTable {
  const src = new Int32Array(states * SLOTS);
  const prob = new Float64Array(states * SLOTS);
  for (let t = 0; t < states; t++) {
    src.fill(t, t * SLOTS, (t + 1) * SLOTS);
    prob[t * SLOTS] = plan.blocked[t >> 2] === 0 ? 1 : 0;
  }
  return compressPull(states, src, prob, () => 0);
}

/**
 * The joint bin of the first JOINT range sensors: key[t] is the rank of the tuple of their bins at state t, and
 * parts[JOINT·u + j] is sensor j's bin in tuple u. A message's likelihood for those sensors is then one table
 * over the (few thousand) distinct tuples, and the per-state pass does one look-up instead of one per sensor.
 */
interface JointBins {
  sensors: number;
  key: Uint32Array;
  parts: Uint16Array;
  count: number;
}
const JOINT = 3;

function buildJointBins(ranges: RangeTable): JointBins {
  const sensors = Math.min(JOINT, ranges.sensors.length);
  const key = new Uint32Array(ranges.states);
  const ids = new Map<number, number>();
  const parts: number[] = [];
  for (let t = 0; t < ranges.states; t++) {
    let code = 0;
    for (let j = 0; j < sensors; j++) code = code * 65536 + ranges.bin[j][t];
    let id = ids.get(code);
    if (id === undefined) {
      id = ids.size;
      ids.set(code, id);
      for (let j = 0; j < JOINT; j++) parts.push(j < sensors ? ranges.bin[j][t] : 0);
    }
    key[t] = id;
  }
  return { sensors, key, parts: Uint16Array.from(parts), count: ids.size };
}

/** out[t] = floor[p] + scale · Σ_k prob[3p+k] · prior[t + delta[3p+k]] with p = code[t] (prediction only); returns Σ out. */
function pull(table: PullTable, prior: Float64Array, scale: number, out: Float64Array): number {
  const { code, delta, prob, floor } = table;
  const states = out.length;
  let sum = 0;
  for (let t = 0; t < states; t++) {
    const p = code[t];
    const j = p * 3;
    const v = floor[p] + scale * (prob[j] * prior[t + delta[j]] + prob[j + 1] * prior[t + delta[j + 1]] + prob[j + 2] * prior[t + delta[j + 2]]);
    out[t] = v;
    sum += v;
  }
  return sum;
}

/** As pull, times joint[key[t]] (and extra[t] when given): prediction and correction in one pass. */
function pullAndCorrect(table: PullTable, prior: Float64Array, scale: number, out: Float64Array, joint: Float64Array, key: Uint32Array, extra: Float64Array | null): number {
  const { code, delta, prob, floor } = table;
  const states = out.length;
  let sum = 0;
  if (extra === null) {
    for (let t = 0; t < states; t++) {
      const p = code[t];
      const j = p * 3;
      const moved = floor[p] + scale * (prob[j] * prior[t + delta[j]] + prob[j + 1] * prior[t + delta[j + 1]] + prob[j + 2] * prior[t + delta[j + 2]]);
      const v = moved * joint[key[t]];
      out[t] = v;
      sum += v;
    }
    return sum;
  }
  for (let t = 0; t < states; t++) {
    const p = code[t];
    const j = p * 3;
    const moved = floor[p] + scale * (prob[j] * prior[t + delta[j]] + prob[j + 1] * prior[t + delta[j + 1]] + prob[j + 2] * prior[t + delta[j + 2]]);
    const v = moved * joint[key[t]] * extra[t];
    out[t] = v;
    sum += v;
  }
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
  const pulls = buildPullTables(plan, table, model.mix, model.mix / freeStates);
  const identity = identityPull(plan, states);
  const classes = markClasses(plan);
  const joint = buildJointBins(ranges);
  const jointL = new Float64Array(joint.count);
  const extra = new Float64Array(states);
  const scratch = new Float64Array(states);
  let current: Float64Array = uniformBelief(plan);
  let spare: Float64Array = new Float64Array(states);
  // The belief is kept unnormalised between updates (its mass in `mass`): every update divides by the prior's
  // mass on the fly, so the separate normalisation pass runs only when someone reads `belief`.
  let mass = 1;

  const normalise = (): void => {
    if (mass === 1) return;
    const inv = 1 / mass;
    for (let s = 0; s < states; s++) current[s] *= inv;
    mass = 1;
  };

  /** Folds one reading per joint sensor into jointL; returns the factors left over (floor, further or repeated sensors). */
  const foldJoint = (factors: readonly ReadingFactor[]): ReadingFactor[] => {
    const slots: (Float64Array | null)[] = [null, null, null];
    const rest: ReadingFactor[] = [];
    for (const f of factors) {
      const j = f.bin === undefined ? -1 : ranges.bin.indexOf(f.bin);
      if (j >= 0 && j < joint.sensors && slots[j] === null) slots[j] = f.factor;
      else rest.push(f);
    }
    const [f0, f1, f2] = slots;
    const parts = joint.parts;
    for (let u = 0; u < joint.count; u++) {
      const k = u * JOINT;
      jointL[u] = (f0 === null ? 1 : f0[parts[k]]) * (f1 === null ? 1 : f1[parts[k + 1]]) * (f2 === null ? 1 : f2[parts[k + 2]]);
    }
    return rest;
  };

  const update = (table: PullTable, readings: readonly SensorReading[] | null): SenseOutcome => {
    const { factors, ignored } = readings === null ? { factors: [], ignored: [] } : readingFactors(plan, readings, sensors, sensorModel, ranges, classes);
    let sum: number;
    if (factors.length === 0) {
      sum = pull(table, current, 1 / mass, spare);
    } else {
      const rest = foldJoint(factors);
      if (rest.length > 0) {
        extra.fill(1);
        applyFactors(plan, rest, extra);
      }
      sum = pullAndCorrect(table, current, 1 / mass, spare, jointL, joint.key, rest.length > 0 ? extra : null);
    }
    let fellBack = false;
    if (sum > MIN_MASS && Number.isFinite(sum)) {
      mass = sum;
    } else {
      pull(table, current, 1 / mass, scratch);
      fellBack = correctInto(plan, scratch, factors, spare, fallbackMix);
      mass = 1;
    }
    const t = current;
    current = spare;
    spare = t;
    return { fellBack, ignored };
  };

  const motion = (action: Action | number): void => {
    update(pulls[actionIndex(action)], null);
  };
  const sense = (readings: readonly SensorReading[]): SenseOutcome => update(identity, readings);

  return {
    plan,
    model,
    sensors,
    sensorModel,
    table,
    ranges,
    get belief() {
      normalise();
      return current;
    },
    reset(belief?: ArrayLike<number>) {
      mass = 1;
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
      return update(pulls[actionIndex(action)], readings);
    },
    certainty() {
      return certainty(plan, current);
    },
  };
}
