/**
 * A small seeded pseudo-random generator for deterministic demo seeds, tests and benchmarks: the
 * engine's Mulberry32 stream (lib/screening/prng.ts), so the product has one seeded generator. The
 * same seed gives the same sequence on every machine. Not for secrets. Returns numbers in [0, 1).
 */
export { mulberry32 as seededRandom } from './screening/prng';
