/**
 * Seeded pseudo-random numbers for the uncertainty sampling: Mulberry32 (Tommy Ettinger's 32-bit
 * generator, public domain), small and fast, enough for a few thousand Monte Carlo draws; not for
 * cryptography. The same seed gives the same stream on every JavaScript engine (integer ops only).
 */

/** A stream of uniform numbers in [0, 1). */
export type Uniform = () => number;

/** Mulberry32 stream for a 32-bit unsigned seed. */
export function mulberry32(seed: number): Uniform {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/**
 * A seed for sub-stream `k` of `seed` (the 32-bit finaliser of MurmurHash3 over seed and k), so each
 * sampled input has its own stream and switching one input off leaves the others' draws unchanged.
 */
export function subSeed(seed: number, k: number): number {
  let h = (seed ^ Math.imul(k + 1, 0x9e3779b9)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/** Standard normal draw from two uniforms (Box-Muller, cosine branch). */
export function standardNormal(u: Uniform): number {
  const u1 = 1 - u();
  const u2 = u();
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
}

/** Triangular draw on [low, high] with mode `mode` by the inverse CDF of one uniform `p` in [0, 1). */
export function triangular(p: number, low: number, mode: number, high: number): number {
  const w = high - low;
  if (!(w > 0)) return mode;
  const fc = (mode - low) / w;
  if (p < fc) return low + Math.sqrt(p * w * (mode - low));
  return high - Math.sqrt((1 - p) * w * (high - mode));
}

/** Percentile `q` (0..1) of sorted values by linear interpolation between order statistics (Hyndman & Fan type 7). */
export function percentileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = (n - 1) * q;
  const i = Math.floor(h);
  if (i >= n - 1) return sorted[n - 1];
  return sorted[i] + (h - i) * (sorted[i + 1] - sorted[i]);
}
