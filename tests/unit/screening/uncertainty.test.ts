import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  BAND_INPUTS,
  ScreeningInputError,
  centralFigures,
  sampleFigures,
  sampleUncertainty,
  screenFlight,
  UNCERTAIN_INPUTS,
  screenValidated,
  validateScreeningInput,
  type ScreeningResult,
} from '@/lib/screening';
import type { ScreeningInput } from '@/lib/validation/screening';

// Invented certification-style curve (four LTO points), not a real engine.
const ENGINE = { fuelFlowKgS: [0.2, 0.6, 1.8, 2.2], eiNoxGPerKg: [5, 12, 28, 36] };

const transatlantic = {
  route: {
    waypoints: [
      { lat: 51.5, lon: -10 },
      { lat: 50, lon: -50 },
    ],
  },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 40_000,
  emission: { engine: ENGINE, engineCount: 2 },
  month: 1,
};

function screened(raw: unknown): { input: ScreeningInput; result: ScreeningResult } | null {
  try {
    const input = validateScreeningInput(raw);
    return { input, result: screenValidated(input) };
  } catch (e) {
    // Random routes can land on coincident or antipodal points, or a fuel flow no engine has.
    if (e instanceof ScreeningInputError) return null;
    throw e;
  }
}

const flight = fc.record({
  lat0: fc.double({ min: -70, max: 70, noNaN: true }),
  lon0: fc.double({ min: -170, max: 170, noNaN: true }),
  dLat: fc.double({ min: -15, max: 15, noNaN: true }),
  dLon: fc.double({ min: 3, max: 40, noNaN: true }),
  flightLevel: fc.integer({ min: 250, max: 600 }),
  fuelBurnKg: fc.double({ min: 2000, max: 80_000, noNaN: true }),
  direct: fc.boolean(),
  ei: fc.double({ min: 5, max: 40, noNaN: true }),
  month: fc.option(fc.integer({ min: 1, max: 12 }), { nil: undefined }),
  given: fc.option(fc.integer({ min: 7000, max: 17_000 }), { nil: undefined }),
  daylight: fc.option(fc.double({ min: 0.2, max: 0.8, noNaN: true }), { nil: undefined }),
});
type Flight = typeof flight extends fc.Arbitrary<infer T> ? T : never;

const toInput = (f: Flight) => ({
  route: {
    waypoints: [
      { lat: f.lat0, lon: f.lon0 },
      { lat: Math.max(-85, Math.min(85, f.lat0 + f.dLat)), lon: f.lon0 + f.dLon },
    ],
  },
  cruise: { flightLevel: f.flightLevel },
  fuelBurnKg: f.fuelBurnKg,
  emission: f.direct ? { eiNoxGPerKg: f.ei } : { engine: ENGINE, engineCount: 2 },
  month: f.month,
  tropopause: f.given === undefined ? undefined : { altitudeM: f.given },
  assumptions:
    f.daylight === undefined
      ? undefined
      : { daylightFactor: { central: f.daylight, low: f.daylight * 0.8, high: Math.min(1, f.daylight * 1.2) } },
});

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b), 1e-12);

describe('uncertainty sampling: one flight', () => {
  it('rebuilds the engine figures exactly with every input central (the per-segment reuse loses nothing)', () => {
    fc.assert(
      fc.property(flight, (f) => {
        const s = screened(toInput(f));
        if (s === null) return;
        const c = centralFigures(s.input, s.result);
        expect(close(c.noxAboveTropopauseKg, s.result.noxAboveTropopauseKg)).toBe(true);
        expect(close(c.ozoneLossKg, s.result.ozoneLoss.centralKg)).toBe(true);
      }),
      { numRuns: 60 },
    );
  });

  it('orders p5 <= p50 <= p95 for every figure, fraction within 0..1 (fast-check)', () => {
    fc.assert(
      fc.property(flight, fc.integer({ min: 0, max: 2 ** 32 - 1 }), (f, seed) => {
        const s = screened(toInput(f));
        if (s === null) return;
        const u = sampleUncertainty(s.input, s.result, { samples: 60, seed, drivers: false });
        for (const p of [u.noxAboveTropopauseKg, u.fractionAboveTropopause, u.ozoneLossKg]) {
          expect(p.p5).toBeLessThanOrEqual(p.p50);
          expect(p.p50).toBeLessThanOrEqual(p.p95);
          expect(p.p5).toBeGreaterThanOrEqual(0);
        }
        expect(u.fractionAboveTropopause.p95).toBeLessThanOrEqual(1);
      }),
      { numRuns: 60 },
    );
  });

  it("lies within the all-corners band when only the band's own inputs are sampled (fast-check)", () => {
    fc.assert(
      fc.property(flight, fc.integer({ min: 0, max: 2 ** 32 - 1 }), (f, seed) => {
        const s = screened(toInput(f));
        if (s === null) return;
        const u = sampleUncertainty(s.input, s.result, { samples: 80, seed, only: BAND_INPUTS, drivers: false });
        const { lowKg, highKg } = s.result.ozoneLoss;
        const tol = 1e-9 * Math.max(highKg, 1e-30);
        expect(u.ozoneLossKg.p5).toBeGreaterThanOrEqual(lowKg - tol);
        expect(u.ozoneLossKg.p95).toBeLessThanOrEqual(highKg + tol);
        expect(u.outsideScreeningRange).toEqual([]);
        // The band's inputs do not move NOx: its percentiles are the screening's own figure.
        expect(close(u.noxAboveTropopauseKg.p5, s.result.noxAboveTropopauseKg)).toBe(true);
        expect(close(u.noxAboveTropopauseKg.p95, s.result.noxAboveTropopauseKg)).toBe(true);
      }),
      { numRuns: 60 },
    );
  });

  it('says so when sampling the tropopause moves a percentile outside the all-corners band', () => {
    // Given tropopause 200 m above FL370 (11 278 m): nothing above, so the band is 0..0, but a 500 m
    // sigma puts the flight above it in about a third of the samples.
    const r = screenFlight({
      ...transatlantic,
      tropopause: { altitudeM: 11_478 },
      uncertainty: { samples: 400, seed: 3 },
    });
    expect(r.ozoneLoss.highKg).toBe(0);
    expect(r.uncertainty?.ozoneLossKg.p95).toBeGreaterThan(0);
    expect(r.uncertainty?.outsideScreeningRange).toContain('p95');
    expect(r.uncertainty?.note).toMatch(/outside the all-corners screening range/);
  });

  it('gives the same percentiles bit for bit for the same input and seed, and others for another seed', () => {
    const a = screenFlight({ ...transatlantic, uncertainty: { seed: 42 } });
    const b = screenFlight({ ...transatlantic, uncertainty: { seed: 42 } });
    const c = screenFlight({ ...transatlantic, uncertainty: { seed: 43 } });
    expect(a.uncertainty).toStrictEqual(b.uncertainty);
    expect(Object.is(a.uncertainty?.ozoneLossKg.p50, b.uncertainty?.ozoneLossKg.p50)).toBe(true);
    expect(a.uncertainty?.samples).toBe(400);
    expect(c.uncertainty?.ozoneLossKg.p50).not.toBe(a.uncertainty?.ozoneLossKg.p50);
  });

  it('narrows the Monte Carlo error with more samples: p50 of two seeds agrees better at 4000 than at 100', () => {
    const s = screened(transatlantic);
    if (s === null) throw new Error('reference flight must screen');
    const spread = (n: number) => {
      let sum = 0;
      // Five seed pairs, so one lucky pair cannot decide; the error should shrink about as 1/sqrt(n).
      for (let k = 0; k < 5; k++) {
        const a = sampleUncertainty(s.input, s.result, { samples: n, seed: 2 * k + 1, drivers: false });
        const b = sampleUncertainty(s.input, s.result, { samples: n, seed: 2 * k + 2, drivers: false });
        sum +=
          Math.abs(a.ozoneLossKg.p50 - b.ozoneLossKg.p50) +
          Math.abs(a.noxAboveTropopauseKg.p50 - b.noxAboveTropopauseKg.p50) / 10;
      }
      return sum;
    };
    expect(spread(4000)).toBeLessThan(spread(100) / 2);
  });

  it('ranks drivers whose shares sum to 1, and a direct EI explains none of the share above', () => {
    const r = screenFlight({ ...transatlantic, emission: { eiNoxGPerKg: 14 }, uncertainty: { samples: 200 } });
    const d = r.uncertainty?.drivers;
    if (d === undefined) throw new Error('drivers expected');
    for (const list of [d.noxAboveTropopauseKg, d.fractionAboveTropopause, d.ozoneLossKg]) {
      expect(list.reduce((t, x) => t + x.share, 0)).toBeCloseTo(1, 12);
      for (let i = 1; i < list.length; i++) expect(list[i - 1].share).toBeGreaterThanOrEqual(list[i].share);
    }
    // One EI for every segment scales NOx above and NOx total alike, so only the tropopause moves the share.
    expect(d.fractionAboveTropopause[0]).toMatchObject({ input: 'tropopause', share: 1 });
    expect(d.noxAboveTropopauseKg.find((x) => x.input === 'cruise-ei')?.share).toBeGreaterThan(0);
    expect(d.noxAboveTropopauseKg.find((x) => x.input === 'nox-noy')?.share).toBe(0);
    expect(d.method).toMatch(/One-at-a-time/);
  });

  it('drivers equal a brute-force one-at-a-time run of each input on the same draws (the shortcuts are exact)', () => {
    const variance = (xs: Float64Array) => {
      const m = xs.reduce((t, x) => t + x, 0) / xs.length;
      return xs.reduce((t, x) => t + (x - m) ** 2, 0) / (xs.length - 1);
    };
    for (const raw of [
      transatlantic,
      { ...transatlantic, emission: { eiNoxGPerKg: 14 }, month: 7 },
      { ...transatlantic, cruise: { flightLevel: 410 } },
    ]) {
      const s = screened(raw);
      if (s === null) throw new Error('reference flight must screen');
      const u = sampleUncertainty(s.input, s.result, { samples: 150, seed: 11 });
      for (const [key, figure] of [
        ['noxAboveTropopauseKg', 'noxAboveTropopauseKg'],
        ['fractionAboveTropopause', 'fractionAboveTropopause'],
        ['ozoneLossKg', 'ozoneLossKg'],
      ] as const) {
        const v = UNCERTAIN_INPUTS.map((g) => {
          const x = variance(sampleFigures(s.input, s.result, { samples: 150, seed: 11, only: [g] })[figure]);
          return x < 1e-20 * Math.max(1, s.result.noxAboveTropopauseKg ** 2) ? 0 : x;
        });
        const total = v.reduce((t, x) => t + x, 0);
        for (const [j, g] of UNCERTAIN_INPUTS.entries()) {
          const share = u.drivers[key].find((d) => d.input === g)?.share ?? -1;
          expect(share).toBeCloseTo(total > 0 ? v[j] / total : 0, 6);
        }
      }
    }
  });

  it('samples the tropopause more tightly for a given value than for the climatology', () => {
    const clim = screenFlight({ ...transatlantic, uncertainty: { samples: 200 } }).uncertainty;
    const given = screenFlight({
      ...transatlantic,
      tropopause: { pressureHpa: 250 },
      uncertainty: { samples: 200 },
    }).uncertainty;
    // Mateus et al. 2022 RMSE about 0.7 km for the lookup-table model; a given value 0.5 km (from memory).
    expect(clim?.sampled.find((x) => x.input === 'tropopause')?.distribution).toMatch(/sigma 0\.7 km/);
    expect(given?.sampled.find((x) => x.input === 'tropopause')?.distribution).toMatch(/sigma 0\.5 km/);
  });

  it('refuses sample counts and seeds outside their ranges, naming the field', () => {
    for (const [u, path] of [
      [{ samples: 49 }, 'uncertainty.samples'],
      [{ samples: 5001 }, 'uncertainty.samples'],
      [{ samples: 100.5 }, 'uncertainty.samples'],
      [{ seed: -1 }, 'uncertainty.seed'],
      [{ seed: 1.5 }, 'uncertainty.seed'],
      [{ seeds: 1 }, 'uncertainty'],
    ] as const) {
      let err: unknown;
      try {
        screenFlight({ ...transatlantic, uncertainty: u });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(ScreeningInputError);
      expect((err as ScreeningInputError).fields.map((f) => f.path)).toContain(path);
    }
  });

  it('leaves the result without uncertainty unless asked for', () => {
    expect(screenFlight(transatlantic).uncertainty).toBeUndefined();
  });
});
