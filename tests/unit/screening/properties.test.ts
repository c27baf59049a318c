import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ScreeningInputError, screenFlight, screenTotals, validateScreeningInput } from '@/lib/screening';

const coord = fc.record({
  lat: fc.double({ min: -85, max: 85, noNaN: true }),
  lon: fc.double({ min: -180, max: 180, noNaN: true }),
});

const directFlight = fc.record({
  waypoints: fc.array(coord, { minLength: 2, maxLength: 5 }),
  flightLevel: fc.integer({ min: 0, max: 660 }),
  fuelBurnKg: fc.double({ min: 1, max: 500_000, noNaN: true }),
  ei: fc.double({ min: 0, max: 200, noNaN: true }),
  month: fc.option(fc.integer({ min: 1, max: 12 }), { nil: undefined }),
  mach: fc.double({ min: 0.1, max: 3, noNaN: true }),
});

function screenOrNull(input: unknown) {
  try {
    return screenFlight(input);
  } catch (e) {
    // Random routes can land on coincident or antipodal points: that is a validation error too.
    if (e instanceof ScreeningInputError) return null;
    throw e;
  }
}

type DirectFlight = typeof directFlight extends fc.Arbitrary<infer T> ? T : never;

const toInput = (f: DirectFlight) => ({
  route: { waypoints: f.waypoints },
  cruise: { flightLevel: f.flightLevel },
  fuelBurnKg: f.fuelBurnKg,
  emission: { eiNoxGPerKg: f.ei },
  month: f.month,
  mach: f.mach,
});

describe('engine properties (fast-check)', () => {
  it('screenTotals gives exactly the totals of the full screening (direct EI, engine data, step climbs, soundings)', () => {
    // Invented certification-style curve (four LTO points), not a real engine.
    const engine = { fuelFlowKgS: [0.11, 0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10.0, 22.5, 28.8] };
    const emission = fc.oneof(
      fc.record({ eiNoxGPerKg: fc.double({ min: 0, max: 200, noNaN: true }) }),
      fc.record({
        engine: fc.constant(engine),
        engineCount: fc.integer({ min: 1, max: 4 }),
        method: fc.constantFrom('bffm2', 'dlr'),
      }),
    );
    const cruise = fc.oneof(
      fc.record({ flightLevel: fc.integer({ min: 0, max: 660 }) }),
      fc
        .tuple(fc.integer({ min: 250, max: 450 }), fc.integer({ min: 1, max: 3000 }), fc.integer({ min: 10, max: 80 }))
        .map(([fl, km, up]) => ({
          steps: [
            { fromKm: 0, flightLevel: fl },
            { fromKm: km, flightLevel: fl + up },
          ],
        })),
    );
    const tropopause = fc.oneof(
      fc.constant(undefined),
      fc.record({ altitudeM: fc.integer({ min: 6000, max: 18000 }) }),
    );
    fc.assert(
      fc.property(directFlight, emission, cruise, tropopause, (f, em, cr, tp) => {
        const raw = { ...toInput(f), emission: em, cruise: cr, ...(tp ? { tropopause: tp } : {}) };
        const full = screenOrNull(raw);
        if (full === null) return;
        const t = screenTotals(validateScreeningInput(raw));
        expect(t).toEqual({
          engineVersion: full.engineVersion,
          distanceKm: full.distanceKm,
          fuelKg: full.fuelKg,
          noxTotalKg: full.noxTotalKg,
          noxAboveTropopauseKg: full.noxAboveTropopauseKg,
          fractionAboveTropopause: full.fractionAboveTropopause,
          meanDepthAboveTropopauseKm: full.meanDepthAboveTropopauseKm,
          ozoneLoss: {
            centralKg: full.ozoneLoss.centralKg,
            lowKg: full.ozoneLoss.lowKg,
            highKg: full.ozoneLoss.highKg,
            o3PerNox: full.ozoneLoss.o3PerNox,
            chainLength: full.ozoneLoss.chainLength,
          },
        });
      }),
      { numRuns: 150 },
    );
  });

  it('NOx = fuel x EI for a direct EI; segments sum to the totals; fraction in [0, 1]', () => {
    fc.assert(
      fc.property(directFlight, (f) => {
        const r = screenOrNull(toInput(f));
        if (r === null) return;
        const tol = 1e-9 * Math.max(1, r.noxTotalKg);
        expect(Math.abs(r.noxTotalKg - (f.fuelBurnKg * f.ei) / 1000)).toBeLessThan(tol + 1e-9 * f.fuelBurnKg);
        const fuel = r.segments.reduce((a, s) => a + s.fuelKg, 0);
        const nox = r.segments.reduce((a, s) => a + s.noxKg, 0);
        const above = r.segments.reduce((a, s) => a + (s.aboveTropopause ? s.noxKg : 0), 0);
        expect(Math.abs(fuel - r.fuelKg)).toBeLessThan(1e-9 * r.fuelKg);
        expect(Math.abs(nox - r.noxTotalKg)).toBeLessThan(tol);
        expect(Math.abs(above - r.noxAboveTropopauseKg)).toBeLessThan(tol);
        expect(r.fractionAboveTropopause).toBeGreaterThanOrEqual(0);
        expect(r.fractionAboveTropopause).toBeLessThanOrEqual(1);
        expect(r.ozoneLoss.lowKg).toBeLessThanOrEqual(r.ozoneLoss.centralKg);
        expect(r.ozoneLoss.centralKg).toBeLessThanOrEqual(r.ozoneLoss.highKg);
      }),
      { numRuns: 150 },
    );
  });

  it('with a direct EI and the same fuel, a higher level never has less NOx above the tropopause', () => {
    fc.assert(
      fc.property(directFlight, fc.integer({ min: 1, max: 200 }), (f, up) => {
        const low = screenOrNull(toInput(f));
        if (low === null) return;
        const high = screenFlight(toInput({ ...f, flightLevel: Math.min(660, f.flightLevel + up) }));
        expect(high.noxAboveTropopauseKg).toBeGreaterThanOrEqual(low.noxAboveTropopauseKg * (1 - 1e-12));
      }),
      { numRuns: 150 },
    );
  });

  it('any value as input: a result or a ScreeningInputError, never another exception', () => {
    fc.assert(
      fc.property(
        fc.anything({ withObjectString: true, withNullPrototype: true, withBigInt: true, withDate: true }),
        (x) => {
          try {
            screenFlight(x);
          } catch (e) {
            expect(e).toBeInstanceOf(ScreeningInputError);
            expect((e as ScreeningInputError).fields.length).toBeGreaterThan(0);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it('a valid input with one field replaced by junk: a result or a ScreeningInputError naming fields', () => {
    const junk = fc.oneof(
      fc.anything(),
      fc.double(),
      fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, -1, 0, 1e12, '', 'EGLL', [], {}, null),
    );
    const paths = [
      ['route'],
      ['route', 'waypoints'],
      ['route', 'waypoints', 0],
      ['route', 'waypoints', 1, 'lat'],
      ['cruise'],
      ['cruise', 'flightLevel'],
      ['cruise', 'steps'],
      ['fuelBurnKg'],
      ['mach'],
      ['emission'],
      ['emission', 'eiNoxGPerKg'],
      ['emission', 'engine'],
      ['emission', 'engine', 'fuelFlowKgS', 2],
      ['emission', 'engineCount'],
      ['month'],
      ['flightDate'],
      ['tropopause'],
      ['tropopause', 'sounding'],
      ['tropopause', 'sounding', 1],
      ['tropopause', 'sounding', 1, 'pressureHpa'],
      ['assumptions'],
      ['assumptions', 'residenceTime'],
      ['assumptions', 'ozoneProfile'],
    ] as (string | number)[][];
    const base = () => ({
      route: { waypoints: [{ airport: 'EGLL' }, { lat: 50, lon: -30 }, { airport: 'KJFK' }] },
      cruise: { flightLevel: 370 } as Record<string, unknown>,
      fuelBurnKg: 30_000,
      mach: 0.84,
      emission: {
        engine: { fuelFlowKgS: [0.2, 0.6, 1.8, 2.2], eiNoxGPerKg: [5, 11, 28, 36] },
        engineCount: 2,
      } as Record<string, unknown>,
      month: 5,
      flightDate: '2026-05-04',
      tropopause: {
        sounding: [
          { altitudeM: 8000, pressureHpa: 356, temperatureK: 236 },
          { altitudeM: 10_000, pressureHpa: 264, temperatureK: 223 },
          { altitudeM: 12_000, pressureHpa: 193, temperatureK: 218 },
          { altitudeM: 14_000, pressureHpa: 141, temperatureK: 218 },
        ],
      } as Record<string, unknown>,
      assumptions: {
        residenceTime: { depthKm: [0, 5], years: [0.2, 1] },
        ozoneProfile: 'midlatitude-summer',
      } as Record<string, unknown>,
    });
    fc.assert(
      fc.property(fc.constantFrom(...paths), junk, (path, value) => {
        const input = base() as unknown as Record<string | number, unknown>;
        let node = input;
        for (const k of path.slice(0, -1)) {
          const next = node[k];
          if (typeof next !== 'object' || next === null) return;
          node = next as Record<string | number, unknown>;
        }
        node[path[path.length - 1]] = value;
        try {
          screenFlight(input);
        } catch (e) {
          expect(e).toBeInstanceOf(ScreeningInputError);
          expect((e as ScreeningInputError).fields.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 500 },
    );
  });
});

/** Every number anywhere in a value, with its path. */
function numbersIn(x: unknown, path = '', out: [string, number][] = []): [string, number][] {
  if (typeof x === 'number') out.push([path, x]);
  else if (Array.isArray(x)) x.forEach((v, i) => numbersIn(v, `${path}.${i}`, out));
  else if (typeof x === 'object' && x !== null)
    for (const [k, v] of Object.entries(x)) numbersIn(v, `${path}.${k}`, out);
  return out;
}

const TURBOFAN = { fuelFlowKgS: [0.11, 0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10.0, 22.5, 28.8] };

describe('figures that point the right way (fast-check)', () => {
  it('no NaN or infinity anywhere in a result, for any valid input (direct EI or engine data, month, date or neither, any level and Mach)', () => {
    const emission = fc.oneof(
      fc.record({ eiNoxGPerKg: fc.double({ min: 0, max: 200, noNaN: true }) }),
      fc.record({
        engine: fc.constant(TURBOFAN),
        engineCount: fc.integer({ min: 1, max: 8 }),
        method: fc.constantFrom('bffm2' as const, 'dlr' as const),
      }),
    );
    const when = fc.oneof(
      fc.constant({}),
      fc.integer({ min: 1, max: 12 }).map((month) => ({ month })),
      fc
        .date({ min: new Date('2020-01-01'), max: new Date('2030-12-31'), noInvalidDate: true })
        .map((d) => ({ flightDate: d.toISOString().slice(0, 10) })),
    );
    fc.assert(
      fc.property(directFlight, emission, when, (f, em, w) => {
        const { month: _m, ...rest } = toInput(f);
        const r = screenOrNull({ ...rest, ...w, emission: em });
        if (r === null) return;
        for (const [path, v] of numbersIn(r)) expect(Number.isFinite(v), path).toBe(true);
      }),
      { numRuns: 200 },
    );
  });

  it('EI bounded for any fuel: a screening with engine data either refuses the fuel (naming fuelBurnKg) or keeps every EI within 0-200 g/kg', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 500_000, noNaN: true }),
        fc.integer({ min: 0, max: 660 }),
        fc.integer({ min: 1, max: 4 }),
        (fuel, fl, n) => {
          try {
            const r = screenFlight({
              route: {
                waypoints: [
                  { lat: 51.5, lon: -0.5 },
                  { lat: 48.9, lon: 2.5 },
                ],
              },
              cruise: { flightLevel: fl },
              fuelBurnKg: fuel,
              emission: { engine: TURBOFAN, engineCount: n },
              month: 1,
            });
            for (const l of r.levels) {
              expect(l.eiNoxGPerKg).toBeGreaterThan(0);
              expect(l.eiNoxGPerKg).toBeLessThanOrEqual(200);
            }
            expect(r.noxTotalKg).toBeLessThan(r.fuelKg);
          } catch (e) {
            expect(e).toBeInstanceOf(ScreeningInputError);
            expect((e as ScreeningInputError).fields.map((x) => x.path)).toEqual(['fuelBurnKg']);
            expect((e as ScreeningInputError).fields[0].message).toMatch(/kg\/s per engine/);
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  const supersonic = (lat: number, flightDate: string, fl = 600) =>
    screenFlight({
      route: {
        waypoints: [
          { lat, lon: 0 },
          { lat, lon: 30 / Math.max(0.2, Math.cos((lat * Math.PI) / 180)) },
        ],
      },
      cruise: { flightLevel: fl },
      mach: 2,
      fuelBurnKg: 40_000,
      emission: { eiNoxGPerKg: 10 },
      flightDate,
    });
  const perKg = (r: ReturnType<typeof screenFlight>) => r.ozoneLoss.centralKg / r.noxAboveTropopauseKg;

  // Same tropopause, ozone profile and level, so that only the sunlight differs: NOx emitted into the
  // polar night meets sunlight only when it returns. (With the climatology the winter tropopause is
  // lower, so the same level is deeper and stays longer: that difference is real, not a sunlight one.)
  // Shallow injections (at most 1.5 km above, residence under half a year), so that the weighting
  // exp(-t/tau) keeps most of the weight on the first months after the flight.
  const polar = (lat: number, flightDate: string, fl: number) =>
    screenFlight({
      route: {
        waypoints: [
          { lat, lon: 0 },
          { lat, lon: 40 },
        ],
      },
      cruise: { flightLevel: fl },
      fuelBurnKg: 20_000,
      emission: { eiNoxGPerKg: 12 },
      flightDate,
      tropopause: { pressureHpa: 300 },
      assumptions: { ozoneProfile: 'subarctic-winter' },
    });
  it('less loss per kg for NOx emitted into polar night than into polar day (it meets sunlight only when it returns), same place, level and tropopause', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 72, max: 85, noNaN: true }),
        fc.constantFrom(1, -1),
        fc.integer({ min: 310, max: 350 }),
        (lat, hemi, fl) => {
          const night = polar(hemi * lat, hemi > 0 ? '2026-12-21' : '2026-06-21', fl);
          const day = polar(hemi * lat, hemi > 0 ? '2026-06-21' : '2026-12-21', fl);
          expect(night.noxAboveTropopauseKg).toBeGreaterThan(0);
          expect(perKg(night)).toBeLessThan(perKg(day));
        },
      ),
      { numRuns: 40 },
    );
  });

  // The whole engine, climatology and all: the winter tropopause is lower (the same level is deeper
  // and stays longer) and the winter ozone profile differs, yet NOx emitted into the polar night is
  // mostly removed (first-order, e-folding tau) or turned into HNO3 (N2O5 hydrolysis in the dark)
  // before the sun returns, while NOx emitted into the polar day works at once. At the levels
  // subsonic aircraft fly (residence under about 0.8 yr here) that outweighs the rest. Deeper
  // injections stay a year or more and meet the next summer either way, so they are not claimed.
  const wholeEngine = (lat: number, flightDate: string, fl: number) =>
    screenFlight({
      route: {
        waypoints: [
          { lat, lon: 0 },
          { lat, lon: 40 },
        ],
      },
      cruise: { flightLevel: fl },
      fuelBurnKg: 20_000,
      emission: { eiNoxGPerKg: 12 },
      flightDate,
    });
  it('whole engine: less loss per kg of NOx above the tropopause for a polar-night flight than for the same flight in polar day (70-85 degrees, January against July, FL350-410, both hemispheres)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 70, max: 85, noNaN: true }),
        fc.constantFrom(1, -1),
        fc.integer({ min: 35, max: 41 }).map((x) => x * 10),
        (lat, hemi, fl) => {
          const night = wholeEngine(hemi * lat, hemi > 0 ? '2026-01-15' : '2026-07-15', fl);
          const day = wholeEngine(hemi * lat, hemi > 0 ? '2026-07-15' : '2026-01-15', fl);
          expect(night.noxAboveTropopauseKg).toBeGreaterThan(0);
          expect(day.noxAboveTropopauseKg).toBeGreaterThan(0);
          expect(perKg(night)).toBeLessThan(perKg(day));
        },
      ),
      { numRuns: 40 },
    );
  });

  it('engine 2026.12.4 moved the polar-night figure down: at 70N FL390 the January flight now scores below the July one (2026.12.3 averaged sunlight over a flat residence window, so the January emission met the whole coming summer and scored about 1.8 times July)', () => {
    const jan = perKg(wholeEngine(70, '2026-01-15', 390));
    const jul = perKg(wholeEngine(70, '2026-07-15', 390));
    expect(jan).toBeLessThan(jul);
    expect(wholeEngine(70, '2026-01-15', 390).ozoneLoss.assumptions.sunlight.activeShare).toBeLessThan(0.8);
  });

  it('tropical injections are not an order of magnitude below mid-latitude ones (supersonic cruise, FL600; published fleet studies put the largest loss over the tropics, Zhang et al. 2023)', () => {
    for (const date of ['2026-01-15', '2026-04-15', '2026-07-15', '2026-10-15']) {
      const tropics = supersonic(5, date);
      const mid = Math.max(perKg(supersonic(45, date)), perKg(supersonic(-45, date)));
      expect(perKg(tropics)).toBeGreaterThan(mid / 10);
    }
  });

  it('summer is above winter: more NOx above the tropopause at FL350 over 45N in January than in July, and over 45S in July than in January', () => {
    const at = (lat: number, month: number) =>
      screenFlight({
        route: {
          waypoints: [
            { lat, lon: 0 },
            { lat, lon: 20 },
          ],
        },
        cruise: { flightLevel: 350 },
        fuelBurnKg: 10_000,
        emission: { eiNoxGPerKg: 12 },
        month,
      }).noxAboveTropopauseKg;
    expect(at(45, 1)).toBeGreaterThan(at(45, 7));
    expect(at(-45, 7)).toBeGreaterThan(at(-45, 1));
  });
});
