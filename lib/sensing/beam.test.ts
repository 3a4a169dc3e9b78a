import { describe, expect, it } from "vitest";
// @ts-expect-error jstat ships no type declarations
import jstatModule from "jstat";
import { beamLikelihood, erfc, hitNormaliser, normalCdf, shortNormaliser } from "./beam";
import type { BeamParams } from "./model";

const jStat = (jstatModule as { jStat: { normal: { cdf(x: number, mean: number, sd: number): number }; erfc(x: number): number } }).jStat;

// CHECKS.md "Beam range-finder model" (Probabilistic Robotics §6.3; numbers computed with those formulas, not from the book).
const params: BeamParams = { sigmaM: 0.1, lambdaShort: 0.5, weights: { hit: 0.4, short: 0.2, max: 0.25, rand: 0.15 } };
const zMax = 5;
const zStar = 3;

/** Composite Simpson's rule on [a, b] with n (even) intervals. */
function simpson(f: (z: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

describe("beam model, CHECKS.md numeric check (z_max 5, z* 3, σ 0.1, λ 0.5, weights 0.4/0.2/0.25/0.15)", () => {
  it("short normaliser 1/(1 − e^(−λz*)) = 1.2872170", () => {
    expect(shortNormaliser(zStar, params.lambdaShort)).toBeCloseTo(1.287217, 6);
  });
  it("p(3) = 1.6544908 and p(1) = 0.1080737", () => {
    expect(beamLikelihood(3, zStar, zMax, params)).toBeCloseTo(1.6544908, 6);
    expect(beamLikelihood(1, zStar, zMax, params)).toBeCloseTo(0.1080737, 6);
  });
  it("continuous part integrates to 0.75 over [0, 5); with the point mass at z_max the total is 1", () => {
    const continuous = (z: number) => beamLikelihood(z, zStar, zMax, params);
    // Split at z* (the short term's edge) and around the narrow hit peak so that Simpson sees smooth pieces.
    const integral = simpson(continuous, 0, 2.5, 2000) + simpson(continuous, 2.5, 3, 4000) + simpson(continuous, 3 + 1e-12, 3.5, 4000) + simpson(continuous, 3.5, 5 - 1e-12, 2000);
    expect(integral).toBeCloseTo(0.75, 6);
    const maxMass = beamLikelihood(zMax, zStar, zMax, params) - params.weights.hit * ((1 / (params.sigmaM * Math.sqrt(2 * Math.PI))) * Math.exp(-0.5 * ((zMax - zStar) / params.sigmaM) ** 2)) / hitNormaliser(zStar, zMax, params.sigmaM);
    expect(maxMass).toBeCloseTo(0.25, 12);
    expect(integral + maxMass).toBeCloseTo(1, 6);
  });
  it("readings at or beyond z_max are max readings; negative readings have likelihood 0", () => {
    expect(beamLikelihood(7.5, 2, zMax, params)).toBe(beamLikelihood(zMax, 2, zMax, params));
    expect(beamLikelihood(Infinity, 2, zMax, params)).toBe(beamLikelihood(zMax, 2, zMax, params));
    expect(beamLikelihood(-0.2, 2, zMax, params)).toBe(0);
    expect(Number.isFinite(beamLikelihood(0.3, 0, zMax, params))).toBe(true);
  });
});

describe("normal CDF against jstat", () => {
  it("erfc and Φ agree with jstat to 1e-7 over a range of arguments", () => {
    for (const x of [-4.2, -1.7, -0.3, 0, 0.45, 1.1, 2.9, 5.3]) {
      expect(Math.abs(erfc(x) - jStat.erfc(x))).toBeLessThan(1.2e-7 * Math.max(1, jStat.erfc(x)));
      expect(normalCdf(x)).toBeCloseTo(jStat.normal.cdf(x, 0, 1), 7);
    }
  });
  it("the hit normaliser η is jstat's Φ(z_max) − Φ(0) for N(z*, σ²), near the edges too", () => {
    for (const [zs, sigma] of [
      [3, 0.1],
      [4.95, 0.1],
      [0.02, 0.05],
      [2.2, 1.3],
    ]) {
      const expected = jStat.normal.cdf(zMax, zs, sigma) - jStat.normal.cdf(0, zs, sigma);
      expect(hitNormaliser(zs, zMax, sigma)).toBeCloseTo(expected, 7);
    }
  });
});
