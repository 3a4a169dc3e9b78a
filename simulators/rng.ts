/**
 * Seeded random source for the simulator: mulberry32 for uniforms, Box–Muller for normals.
 *
 * mulberry32 is a 32-bit-state generator, far from cryptographic but fast, small, and
 * identical on every JavaScript engine (it uses only Math.imul and 32-bit shifts), which is
 * what "seeded runs repeat exactly" needs. Box–Muller here uses both outputs of a pair
 * (the second is kept for the next call), so one normal costs one uniform on average.
 * References: mulberry32 by Tommy Ettinger (public domain, 2017), from memory; Box and
 * Muller, "A Note on the Generation of Random Normal Deviates", Ann. Math. Stat. 29 (1958).
 */

/** A random source: the only state is inside the instance, so each simulated robot owns one. */
export interface Rng {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal, mean 0, standard deviation 1. */
  gaussian(): number;
}

/** Creates a mulberry32-based random source from a 32-bit integer seed (other numbers are truncated to 32 bits). */
export function createRng(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new RangeError("createRng: seed must be finite");
  let a = seed | 0;
  let spare: number | null = null;
  const uniform = () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    uniform,
    gaussian() {
      if (spare !== null) {
        const value = spare;
        spare = null;
        return value;
      }
      // 1 − u lies in (0, 1], so the logarithm is finite.
      const radius = Math.sqrt(-2 * Math.log(1 - uniform()));
      const angle = 2 * Math.PI * uniform();
      spare = radius * Math.sin(angle);
      return radius * Math.cos(angle);
    },
  };
}

/** A well-mixed 32-bit seed for the index-th member of a seeded group (e.g. robot k of a fleet). */
export function deriveSeed(seed: number, index: number): number {
  let h = Math.imul((seed | 0) ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(index + 1, 0xc2b2ae35);
  h ^= h >>> 16;
  h = Math.imul(h, 0x7feb352d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x846ca68b);
  return (h ^ (h >>> 16)) | 0;
}
