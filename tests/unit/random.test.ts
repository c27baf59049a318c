import { describe, expect, it } from 'vitest';
import { seededRandom } from '@/lib/random';

describe('seededRandom (the one seeded generator of seeds, tests and benches)', () => {
  it('gives the same sequence for the same seed and another for another seed', () => {
    const take = (seed: number) => {
      const next = seededRandom(seed);
      return Array.from({ length: 5 }, () => next());
    };
    expect(take(20_261_120)).toEqual(take(20_261_120));
    expect(take(20_261_120)).not.toEqual(take(20_261_121));
  });

  it('stays in [0, 1) and spreads evenly: each tenth holds 10 % +- 1 % of 100 000 draws', () => {
    const next = seededRandom(7);
    const bins = new Array<number>(10).fill(0);
    for (let i = 0; i < 100_000; i++) {
      const x = next();
      expect(x >= 0 && x < 1).toBe(true);
      bins[Math.floor(x * 10)] += 1;
    }
    for (const n of bins) expect(Math.abs(n - 10_000)).toBeLessThan(1_000);
  });
});
