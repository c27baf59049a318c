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

const ACKLAM_A = [
  -39.69683028665376, 220.9460984245205, -275.928510446969, 138.357751867269, -30.66479806614716, 2.506628277459239,
];
const ACKLAM_B = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
const ACKLAM_C = [
  -0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968,
  2.938163982698783,
];
const ACKLAM_D = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];

function acklamTail(q: number): number {
  const c = ACKLAM_C;
  const d = ACKLAM_D;
  return (
    (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) /
    ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1)
  );
}

/**
 * Standard normal quantile of p in (0, 1) by P. J. Acklam's rational approximation (relative error
 * about 1.2e-9, coefficients from memory); -Infinity at 0, Infinity at 1.
 */
export function inverseNormal(p: number): number {
  if (p <= 0) return -Infinity;
  if (p >= 1) return Infinity;
  const low = 0.02425;
  if (p < low) return acklamTail(Math.sqrt(-2 * Math.log(p)));
  if (p > 1 - low) return -acklamTail(Math.sqrt(-2 * Math.log(1 - p)));
  const q = p - 0.5;
  const r = q * q;
  const a = ACKLAM_A;
  const b = ACKLAM_B;
  return (
    ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) /
    (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1)
  );
}

/** Nodes of the normal quantile table: 4096 cells on [0, 1]. */
export const NORMAL_TABLE_CELLS = 4096;

/**
 * The standard normal quantile at `NORMAL_TABLE_CELLS + 1` even nodes of [0, 1], held within
 * +/- `limit` sigma: a draw is then one uniform, a lookup and a linear interpolation (no log or
 * trigonometry per draw; the interpolation error is below 1e-3 sigma within 3 sigma).
 */
export function normalQuantileTable(limit: number): Float64Array {
  const t = new Float64Array(NORMAL_TABLE_CELLS + 1);
  for (let i = 0; i <= NORMAL_TABLE_CELLS; i++) {
    const z = inverseNormal(i / NORMAL_TABLE_CELLS);
    t[i] = z > limit ? limit : z < -limit ? -limit : z;
  }
  return t;
}
