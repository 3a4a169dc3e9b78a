import { describe, expect, it } from "vitest";
// @ts-expect-error jstat ships no type declarations
import jstatModule from "jstat";
import { createRng, deriveSeed } from "./rng";

const jStat = (jstatModule as { jStat: { normal: { cdf(x: number, mean: number, sd: number): number } } }).jStat;

/** Largest gap between the sample's empirical CDF and a reference CDF (Kolmogorov–Smirnov statistic). */
function ksStatistic(sample: number[], cdf: (x: number) => number): number {
  const sorted = [...sample].sort((a, b) => a - b);
  let d = 0;
  sorted.forEach((x, i) => {
    const f = cdf(x);
    d = Math.max(d, Math.abs(f - i / sorted.length), Math.abs((i + 1) / sorted.length - f));
  });
  return d;
}

describe("createRng", () => {
  it("repeats exactly from a seed and differs between seeds", () => {
    const a = createRng(7);
    const b = createRng(7);
    const c = createRng(8);
    const first = Array.from({ length: 50 }, () => a.uniform());
    expect(Array.from({ length: 50 }, () => b.uniform())).toEqual(first);
    expect(Array.from({ length: 50 }, () => c.uniform())).not.toEqual(first);
  });

  it("draws uniforms in [0, 1) whose distribution passes a Kolmogorov–Smirnov check", () => {
    const rng = createRng(12345);
    const sample = Array.from({ length: 20_000 }, () => rng.uniform());
    expect(sample.every((u) => u >= 0 && u < 1)).toBe(true);
    // Critical value 1.36/√n at the 5 % level (Kolmogorov's asymptotic table, from memory).
    expect(ksStatistic(sample, (x) => x)).toBeLessThan(1.36 / Math.sqrt(sample.length));
  });

  it("draws standard normals: the sample matches jstat's normal CDF", () => {
    const rng = createRng(-991);
    const sample = Array.from({ length: 20_000 }, () => rng.gaussian());
    const mean = sample.reduce((s, x) => s + x, 0) / sample.length;
    const variance = sample.reduce((s, x) => s + (x - mean) ** 2, 0) / sample.length;
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(variance - 1)).toBeLessThan(0.04);
    expect(ksStatistic(sample, (x) => jStat.normal.cdf(x, 0, 1))).toBeLessThan(1.36 / Math.sqrt(sample.length));
  });
});

describe("deriveSeed", () => {
  it("gives distinct 32-bit seeds to the members of a group and depends on the group's seed", () => {
    const seeds = Array.from({ length: 500 }, (_, i) => deriveSeed(2024, i));
    expect(new Set(seeds).size).toBe(500);
    expect(seeds.every((s) => Number.isInteger(s) && s >= -(2 ** 31) && s < 2 ** 31)).toBe(true);
    expect(deriveSeed(2025, 0)).not.toBe(seeds[0]);
    expect(deriveSeed(2024, 3)).toBe(seeds[3]);
  });
});
