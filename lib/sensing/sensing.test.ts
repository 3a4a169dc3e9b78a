import { describe, expect, it } from "vitest";
import { uniformBelief } from "../belief/belief";
import { parseFloorplan } from "../floorplan/parse";
import { stateIndex } from "../floorplan/types";
import { beamLikelihood } from "./beam";
import type { SensorModel, SensorSpec } from "./model";
import { defaultSensorModel } from "./model";
import { beamAngleRad, buildRangeTable, castRay } from "./ray-cast";
import { senseUpdate, senseUpdateDetailed } from "./update";

// Hand-made plan, tiles of 0.5 m; distances below worked out on paper from tile centres.
const plan = parseFloorplan("000000\n000100\n000000\n100000\n", { tileM: 0.5 });
const N = 0;
const E = 1;
const S = 2;
const cast = (row: number, col: number, heading: number, bearingDeg: number, maxRangeM = 3) => castRay(plan, row, col, beamAngleRad(heading, bearingDeg), maxRangeM);

describe("castRay on a hand-made plan", () => {
  it("axis-aligned rays stop at the first blocked tile or the plan's edge", () => {
    expect(cast(2, 1, E, 0)).toBeCloseTo(2.25, 12); // 4.5 tiles to the right edge
    expect(cast(1, 1, E, 0)).toBeCloseTo(0.75, 12); // 1.5 tiles to the blocked (1,3)
    expect(cast(0, 1, S, 0)).toBeCloseTo(1.75, 12); // 3.5 tiles down to the bottom edge
    expect(cast(2, 1, N, 90)).toBeCloseTo(0.75, 12); // bearing +90° from N looks west
    expect(cast(2, 4, S, -90)).toBeCloseTo(2.25, 12); // bearing −90° from S looks west: row 2 free, 4.5 tiles to the left edge
  });
  it("diagonal rays pass free corners and stop at a corner touching a blocked tile", () => {
    expect(cast(2, 1, N, 45)).toBeCloseTo(1.5 * Math.SQRT2 * 0.5, 12);
    expect(cast(2, 2, N, -45)).toBeCloseTo(0.5 * Math.SQRT2 * 0.5, 12);
  });
  it("an oblique ray (30°) crosses the grid to the right edge, and is capped at the maximum range", () => {
    expect(cast(3, 1, E, 30)).toBeCloseTo((4.5 / Math.cos(Math.PI / 6)) * 0.5, 9);
    expect(cast(3, 1, E, 30, 2)).toBe(2);
  });
  it("the range table holds the same values as Float32 and only a few distinct levels", () => {
    const sensors: SensorSpec[] = [
      { id: "front", kind: "range", bearingDeg: 0, maxRangeM: 3 },
      { id: "floor", kind: "floor" },
      { id: "left", kind: "range", bearingDeg: 30, maxRangeM: 2 },
    ];
    const table = buildRangeTable(plan, sensors);
    expect(table.sensors.map((s) => s.id)).toEqual(["front", "left"]);
    expect(table.expectedM[0][stateIndex(plan, 1, 1, E)]).toBe(Math.fround(0.75));
    expect(table.expectedM[1][stateIndex(plan, 3, 1, E)]).toBe(2);
    expect(table.expectedM[0][stateIndex(plan, 3, 0, N)]).toBe(0);
    for (let s = 0; s < table.states; s++) expect(table.levelsM[1][table.bin[1][s]]).toBe(plan.blocked[s >> 2] ? table.levelsM[1][0] : table.expectedM[1][s]);
    expect(table.levelsM[0].length).toBeLessThan(12);
  });
});

describe("senseUpdate", () => {
  const sensors: SensorSpec[] = [
    { id: "front", kind: "range", bearingDeg: 0, maxRangeM: 2.5 },
    { id: "left", kind: "range", bearingDeg: 90, maxRangeM: 2.5 },
    { id: "floor", kind: "floor" },
  ];

  it("equals prior × Π beam likelihoods computed per state from castRay, normalised", () => {
    const model = defaultSensorModel();
    const prior = uniformBelief(plan);
    prior[stateIndex(plan, 2, 2, E)] *= 3;
    const readings = [
      { sensor: "front", rangeM: 1.22 },
      { sensor: "left", rangeM: 2.5 },
    ];
    const ours = senseUpdate(plan, prior, readings, sensors, model);
    const direct = new Float64Array(prior.length);
    let sum = 0;
    for (let s = 0; s < prior.length; s++) {
      if (plan.blocked[s >> 2]) continue;
      const row = Math.floor((s >> 2) / plan.cols);
      const col = (s >> 2) % plan.cols;
      const front = Math.fround(castRay(plan, row, col, beamAngleRad(s & 3, 0), 2.5));
      const left = Math.fround(castRay(plan, row, col, beamAngleRad(s & 3, 90), 2.5));
      direct[s] = prior[s] * beamLikelihood(1.22, front, 2.5, model.range) * beamLikelihood(2.5, left, 2.5, model.range);
      sum += direct[s];
    }
    for (let s = 0; s < prior.length; s++) expect(ours[s]).toBeCloseTo(direct[s] / sum, 14);
  });

  it("floor sensor: confusion over the K = 3 classes present (0, 2, 5): hit 0.7, others 0.15 each", () => {
    const marked = parseFloorplan("000\n---\n. 2 5\n");
    const model: SensorModel = { ...defaultSensorModel(), floor: { hit: 0.7 } };
    const posterior = senseUpdate(marked, uniformBelief(marked), [{ sensor: "floor", mark: 2 }], sensors, model);
    expect(posterior[stateIndex(marked, 0, 0, 3)]).toBeCloseTo(0.15 / 4, 14);
    expect(posterior[stateIndex(marked, 0, 1, 0)]).toBeCloseTo(0.7 / 4, 14);
    expect(posterior[stateIndex(marked, 0, 2, 2)]).toBeCloseTo(0.15 / 4, 14);
  });

  it("ignores readings of unknown sensors, of the wrong kind, NaN ranges and marks absent from the plan", () => {
    const prior = uniformBelief(plan);
    const result = senseUpdateDetailed(plan, prior, [
      { sensor: "rear", rangeM: 1 },
      { sensor: "floor", rangeM: 1 },
      { sensor: "front", rangeM: Number.NaN },
      { sensor: "floor", mark: 4 },
    ], sensors);
    expect(result.ignored).toEqual(["rear", "floor", "front", "floor"]);
    expect(result.fellBack).toBe(false);
    for (let s = 0; s < prior.length; s++) expect(result.belief[s]).toBeCloseTo(prior[s], 15);
  });

  it("falls back to the mixing floor when no state explains the readings, and says so", () => {
    const strict: SensorModel = { range: { sigmaM: 0.001, lambdaShort: 1, weights: { hit: 1, short: 0, max: 0, rand: 0 } }, floor: { hit: 1 } };
    const prior = new Float64Array(plan.rows * plan.cols * 4);
    prior[stateIndex(plan, 2, 1, E)] = 1;
    // 2.25 m ahead is what (2,1) E sees; 0.4 m is what no state sees with a 1 mm sigma.
    const result = senseUpdateDetailed(plan, prior, [{ sensor: "front", rangeM: 0.4 }], sensors, strict, { fallbackMix: 0.1 });
    expect(result.fellBack).toBe(true);
    let sum = 0;
    for (let s = 0; s < prior.length; s++) {
      expect(Number.isFinite(result.belief[s])).toBe(true);
      expect(result.belief[s]).toBeGreaterThanOrEqual(0);
      if (plan.blocked[s >> 2]) expect(result.belief[s]).toBe(0);
      sum += result.belief[s];
    }
    expect(sum).toBeCloseTo(1, 12);
    expect(result.belief[stateIndex(plan, 2, 1, E)]).toBeCloseTo(0.9 + 0.1 / 88, 12);
    const explained = senseUpdateDetailed(plan, prior, [{ sensor: "front", rangeM: 2.25 }], sensors, strict);
    expect(explained.fellBack).toBe(false);
    expect(explained.belief[stateIndex(plan, 2, 1, E)]).toBe(1);
  });
});
