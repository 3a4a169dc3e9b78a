/**
 * The beam model of a range finder, Probabilistic Robotics (Thrun, Burgard
 * and Fox, 2005) §6.3, eq. 6.4–6.12: a mixture of a Gaussian hit around the
 * expected range z*, an exponential short echo, a point mass at z_max and a
 * uniform random reading.
 *
 * Assumes z* in [0, z_max] from the ray cast. The book's indicator functions
 * are kept literally: hit on [0, z_max], short on [0, z*], max at z = z_max,
 * random on [0, z_max). As in the book, the max term is a probability mass
 * mixed with densities. Departures: readings at or beyond z_max are taken as
 * z_max (the robot link reports "no echo" that way); when z* is 0 the short
 * term's normaliser is unbounded and the term is taken as 0.
 * The normal CDF uses the erfc approximation of Numerical Recipes in C, 2nd
 * ed., §6.2 (fractional error below 1.2e-7; coefficients from memory,
 * cross-checked against jstat in the tests).
 */
import type { BeamParams } from "./model";

const INV_SQRT_2PI = 0.3989422804014327;

/** Complementary error function, fractional error < 1.2e-7 for all real x. */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/** Standard normal cumulative distribution Φ(x), in [0, 1]. */
export function normalCdf(x: number): number {
  return 0.5 * erfc(-x / Math.SQRT2);
}

/** η of the hit term: the mass of N(z*, σ²) on [0, z_max]; 0 when it underflows. */
export function hitNormaliser(zStar: number, zMax: number, sigmaM: number): number {
  return normalCdf((zMax - zStar) / sigmaM) - normalCdf(-zStar / sigmaM);
}

/** Short-echo normaliser 1 / (1 − e^(−λ z*)); 0 when z* ≤ 0. */
export function shortNormaliser(zStar: number, lambdaShort: number): number {
  return zStar > 0 ? 1 / (1 - Math.exp(-lambdaShort * zStar)) : 0;
}

/**
 * p(z | z*) of the beam model, metres in, per metre out (plus the max mass at z = z_max).
 * Readings at or beyond zMax (including +Infinity) are taken as z_max; negative readings get 0; never NaN for finite params.
 */
export function beamLikelihood(z: number, zStar: number, zMax: number, params: BeamParams): number {
  const { sigmaM, lambdaShort, weights } = params;
  if (!(z >= 0)) return 0;
  const zz = z >= zMax ? zMax : z;
  const eta = hitNormaliser(zStar, zMax, sigmaM);
  const u = (zz - zStar) / sigmaM;
  const hit = eta > 0 ? (INV_SQRT_2PI / sigmaM) * Math.exp(-0.5 * u * u) / eta : 0;
  const short = zz <= zStar ? lambdaShort * Math.exp(-lambdaShort * zz) * shortNormaliser(zStar, lambdaShort) : 0;
  const max = zz >= zMax ? 1 : 0;
  const rand = zz < zMax ? 1 / zMax : 0;
  return weights.hit * hit + weights.short * short + weights.max * max + weights.rand * rand;
}
