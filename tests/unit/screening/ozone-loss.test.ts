import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isa } from '@/lib/screening';
import {
  AFGL_ALTITUDE_KM,
  AFGL_O3_PPMV,
  COEFFICIENT_COUNT,
  DEFAULT_OZONE_INPUTS,
  PROFILE_SLOTS,
  fleetOzoneColumnContext,
  lossPerNoxYear,
  oddOxygenBudget,
  resolveOzoneInputs,
  ozoneLossCoefficients,
  ozonePpmv,
  profileSlotFor,
  residenceTimeYears,
} from '@/lib/screening/ozone-loss';

const slot = (name: (typeof PROFILE_SLOTS)[number]) => PROFILE_SLOTS.indexOf(name);

describe('residence time above the tropopause', () => {
  it.each([
    [0, 0.1],
    [1, 0.25],
    [2, 0.5],
    [4, 1.0],
    [6, 1.5],
    [9, 2.0],
    [0.5, 0.175],
    [5, 1.25],
    [12, 2.0],
    [-1, 0.1],
  ])('%s km above -> %s yr (band values at the band lower edges, linear between, flat beyond)', (depth, years) => {
    expect(residenceTimeYears(depth, DEFAULT_OZONE_INPUTS.residenceTime)).toBeCloseTo(years, 12);
  });

  it('never falls below the tabulated value of the band it is in (conservative)', () => {
    const bands = [
      [0, 1, 0.1],
      [1, 2, 0.25],
      [2, 4, 0.5],
      [4, 6, 1.0],
      [6, 9, 1.5],
      [9, 30, 2.0],
    ];
    fc.assert(
      fc.property(fc.double({ min: 0, max: 29.99, noNaN: true }), (d) => {
        const band = bands.find(([lo, hi]) => d >= lo && d < hi)!;
        expect(residenceTimeYears(d, DEFAULT_OZONE_INPUTS.residenceTime)).toBeGreaterThanOrEqual(band[2] - 1e-12);
      }),
    );
  });
});

describe('ozone profile choice', () => {
  it.each([
    { lat: 10, month: 1, want: 'tropical' },
    { lat: -20, month: 7, want: 'tropical' },
    { lat: 40, month: 7, want: 'midlatitude-summer' },
    { lat: 40, month: 1, want: 'midlatitude-winter' },
    { lat: -40, month: 7, want: 'midlatitude-winter' },
    { lat: -40, month: 1, want: 'midlatitude-summer' },
    { lat: 23.5, month: 4, want: 'midlatitude-summer' },
    { lat: 60, month: 9, want: 'subarctic-summer' },
    { lat: 60, month: 10, want: 'subarctic-winter' },
    { lat: -70, month: 12, want: 'subarctic-summer' },
    { lat: 50, month: null, want: 'subarctic-annual-mean' },
    { lat: 30, month: null, want: 'midlatitude-annual-mean' },
  ] as const)('$lat deg, month $month -> $want', ({ lat, month, want }) => {
    expect(PROFILE_SLOTS[profileSlotFor(lat, month)]).toBe(want);
  });

  it('annual-mean slots average summer and winter', () => {
    expect(ozonePpmv(slot('midlatitude-annual-mean'), 15)).toBeCloseTo(0.5 * (ozonePpmv(1, 15) + ozonePpmv(2, 15)), 12);
  });
});

describe('embedded AFGL 1986 O3 profiles against the published tables', () => {
  // Source: Anderson et al. (1986), AFGL Atmospheric Constituent Profiles (0-120 km),
  // AFGL-TR-86-0110, tables 1a (tropical), 1b (midlatitude summer), 1c (midlatitude winter),
  // 1d (subarctic summer), 1e (subarctic winter), O3 column in ppmv at 0-25 km by 1 km, 27.5, 30,
  // 32.5, 35 km; values as tabulated (4 significant figures) in the LOWTRAN/MODTRAN model-atmosphere
  // data, and agreeing within rounding with the 3-figure tables of the open-source joseki library.
  const TABLES: Record<string, number[]> = {
    tropical: [
      2.869e-2, 3.15e-2, 3.342e-2, 3.504e-2, 3.561e-2, 3.767e-2, 3.989e-2, 4.223e-2, 4.471e-2, 5.0e-2, 5.595e-2,
      6.613e-2, 7.815e-2, 9.289e-2, 1.05e-1, 1.256e-1, 1.444e-1, 2.5e-1, 5.0e-1, 9.5e-1, 1.4, 1.8, 2.4, 3.4, 4.3, 5.4,
      7.8, 9.3, 9.85, 9.7,
    ],
    'midlatitude-summer': [
      3.017e-2, 3.337e-2, 3.694e-2, 4.222e-2, 4.821e-2, 5.512e-2, 6.408e-2, 7.764e-2, 9.126e-2, 1.111e-1, 1.304e-1,
      1.793e-1, 2.23e-1, 3.0e-1, 4.4e-1, 5.0e-1, 6.0e-1, 7.0e-1, 1.0, 1.5, 2.0, 2.4, 2.9, 3.4, 4.0, 4.8, 6.0, 7.0, 8.1,
      8.9,
    ],
    'midlatitude-winter': [
      2.778e-2, 2.8e-2, 2.849e-2, 3.2e-2, 3.567e-2, 4.72e-2, 5.837e-2, 7.891e-2, 1.039e-1, 1.567e-1, 2.37e-1, 3.624e-1,
      5.232e-1, 7.036e-1, 8.0e-1, 9.0e-1, 1.1, 1.4, 1.8, 2.3, 2.9, 3.5, 3.9, 4.3, 4.7, 5.1, 5.6, 6.1, 6.8, 7.1,
    ],
    'subarctic-summer': [
      2.412e-2, 2.94e-2, 3.379e-2, 3.887e-2, 4.478e-2, 5.328e-2, 6.564e-2, 7.738e-2, 9.114e-2, 1.42e-1, 1.89e-1,
      3.05e-1, 4.1e-1, 5.0e-1, 6.0e-1, 7.0e-1, 8.5e-1, 1.0, 1.3, 1.7, 2.1, 2.7, 3.3, 3.7, 4.2, 4.5, 5.3, 5.7, 6.9, 7.7,
    ],
    'subarctic-winter': [
      1.802e-2, 2.072e-2, 2.336e-2, 2.767e-2, 3.253e-2, 3.801e-2, 4.446e-2, 7.252e-2, 1.04e-1, 2.1e-1, 3.0e-1, 3.5e-1,
      4.0e-1, 6.5e-1, 9.0e-1, 1.2, 1.5, 1.9, 2.45, 3.1, 3.7, 4.0, 4.2, 4.5, 4.6, 4.7, 4.9, 5.4, 5.9, 6.2,
    ],
  };
  it("the grid is the report's 0-35 km grid", () => {
    expect(AFGL_ALTITUDE_KM).toEqual([...Array.from({ length: 26 }, (_, i) => i), 27.5, 30, 32.5, 35]);
  });
  it.each(Object.keys(TABLES))('%s equals the table to its printed precision', (name) => {
    const got = AFGL_O3_PPMV[name as keyof typeof AFGL_O3_PPMV];
    expect(got.length).toBe(TABLES[name].length);
    got.forEach((v, i) =>
      expect(Math.abs(v - TABLES[name][i]) / TABLES[name][i], `${name} at ${AFGL_ALTITUDE_KM[i]} km`).toBeLessThan(
        5e-4,
      ),
    );
  });
  it('every embedded profile is one of the tables', () => {
    expect(Object.keys(AFGL_O3_PPMV).sort()).toEqual(Object.keys(TABLES).sort());
  });
});

describe('embedded AFGL 1986 O3 profiles: shape checks against common knowledge', () => {
  const names = Object.keys(AFGL_O3_PPMV) as (keyof typeof AFGL_O3_PPMV)[];
  it.each(names)(
    '%s: one value per grid altitude, 20-100 ppbv in the lower troposphere, rising from 12 to 30 km, 5-10 ppmv at 30 km',
    (name) => {
      const p = AFGL_O3_PPMV[name];
      expect(p.length).toBe(AFGL_ALTITUDE_KM.length);
      for (let i = 0; i <= 5; i++) {
        expect(p[i]).toBeGreaterThan(0.015);
        expect(p[i]).toBeLessThan(0.1);
      }
      const i12 = AFGL_ALTITUDE_KM.indexOf(12);
      const i30 = AFGL_ALTITUDE_KM.indexOf(30);
      for (let i = i12; i < i30; i++) expect(p[i + 1]).toBeGreaterThan(p[i]);
      expect(p[i30]).toBeGreaterThan(5);
      expect(p[i30]).toBeLessThan(10);
    },
  );

  it('tropical ozone stays tropospheric (below 0.2 ppmv) up to 16 km, the tropical tropopause (common knowledge)', () => {
    const i16 = AFGL_ALTITUDE_KM.indexOf(16);
    for (let i = 0; i <= i16; i++) expect(AFGL_O3_PPMV.tropical[i]).toBeLessThan(0.2);
  });
});

describe('loss coefficients', () => {
  const coef = (t: number, m: number, ppmv: number) => {
    const out = new Float64Array(COEFFICIENT_COUNT);
    ozoneLossCoefficients(t, m, ppmv, DEFAULT_OZONE_INPUTS, out);
    return out;
  };
  const s16 = isa(16_000);

  it('no sunlight, no loss: zero (never NaN) when the sun never rises or the daylight factor is 0', () => {
    const c = coef(s16.temperatureK, s16.numberDensityCm3, 1.0);
    expect(lossPerNoxYear(c, 0, 0, 0.5)).toBe(0);
    expect(lossPerNoxYear(c, 0, 0.5, 0)).toBe(0);
  });

  it('more sunlight, more loss: [O] rises with J(O3) (photostationary state), so the loss rises with the sun height and the daylight factor', () => {
    const c = coef(s16.temperatureK, s16.numberDensityCm3, 1.0);
    expect(lossPerNoxYear(c, 0, 0.6, 0.5)).toBeGreaterThan(lossPerNoxYear(c, 0, 0.3, 0.5));
    expect(lossPerNoxYear(c, 0, 0.6, 0.5)).toBeGreaterThan(lossPerNoxYear(c, 0, 0.6, 0.3));
  });

  it('more ozone, more loss (the NOx cycle runs on O from O3 photolysis); a zero ozone profile gives zero, not NaN', () => {
    const lo = coef(s16.temperatureK, s16.numberDensityCm3, 0.5);
    const hi = coef(s16.temperatureK, s16.numberDensityCm3, 2.0);
    expect(lossPerNoxYear(hi, 0, 0.5, 0.5)).toBeGreaterThan(lossPerNoxYear(lo, 0, 0.5, 0.5));
    const zero = coef(s16.temperatureK, s16.numberDensityCm3, 0);
    expect(lossPerNoxYear(zero, 0, 0.5, 0.5)).toBe(0);
    expect(Number.isNaN(zero[6])).toBe(false);
  });

  it('low <= central <= high for any level and sunlight (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 190, max: 250, noNaN: true }),
        fc.double({ min: 1e17, max: 2e19, noNaN: true }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (t, m, ppmv, sun, d) => {
          const c = coef(t, m, ppmv);
          const [l, ce, h] = [1, 0, 2].map((k) => lossPerNoxYear(c, k as 0 | 1 | 2, sun, d));
          expect(l).toBeLessThanOrEqual(ce * (1 + 1e-12));
          expect(ce).toBeLessThanOrEqual(h * (1 + 1e-12));
          expect(Number.isFinite(h)).toBe(true);
        },
      ),
    );
  });
});

describe('residence time by latitude (tropical upwelling vs extratropical flushing)', () => {
  const rt = DEFAULT_OZONE_INPUTS.residenceTime;
  it('NOx injected just above the tropical tropopause stays longer than just above the extratropical one (Holton et al. 1995; Waugh & Hall 2002)', () => {
    for (const d of [0, 0.5, 1, 2])
      expect(residenceTimeYears(d, rt, 5)).toBeGreaterThan(2 * residenceTimeYears(d, rt, 50));
  });

  it('is the tropical table to 20 degrees, the extratropical one from 30, linear between; symmetric in the hemispheres', () => {
    expect(residenceTimeYears(1, rt, 20)).toBeCloseTo(1.5, 12);
    expect(residenceTimeYears(1, rt, -30)).toBeCloseTo(0.25, 12);
    expect(residenceTimeYears(1, rt, 25)).toBeCloseTo((1.5 + 0.25) / 2, 12);
    expect(residenceTimeYears(1, rt, -25)).toBeCloseTo(residenceTimeYears(1, rt, 25), 12);
  });

  it('an override of the extratropical years on the default depth nodes keeps the tropical table; on other nodes it applies everywhere, and tropicalYears sets the tropics', () => {
    const same = resolveOzoneInputs({
      residenceTime: { depthKm: [0, 1, 2, 4, 6, 9], years: [0.2, 0.3, 0.6, 1, 1.5, 2] },
    }).residenceTime;
    expect(residenceTimeYears(0, same, 0)).toBeCloseTo(1.0, 12);
    expect(residenceTimeYears(0, same, 60)).toBeCloseTo(0.2, 12);
    const other = resolveOzoneInputs({ residenceTime: { depthKm: [0, 5], years: [0.2, 1] } }).residenceTime;
    expect(residenceTimeYears(0, other, 0)).toBeCloseTo(0.2, 12);
    const given = resolveOzoneInputs({
      residenceTime: { depthKm: [0, 5], years: [0.2, 1], tropicalYears: [2, 3] },
    }).residenceTime;
    expect(residenceTimeYears(0, given, 0)).toBeCloseTo(2, 12);
  });

  it('injections where airliners put most of their stratospheric NOx, 0-1 km above the extratropical tropopause, stay 0.1-0.25 yr (36-91 days): the same order as the about 50 days found for aircraft emissions deposited in the stratosphere (Gettelman 1999, PhD thesis, University of Washington, transport and trajectory models)', () => {
    for (const lat of [40, 55, 70, -50]) {
      for (const d of [0, 0.25, 0.5, 0.75, 1]) {
        const days = residenceTimeYears(d, rt, lat) * 365;
        expect(days).toBeGreaterThan(50 / 2);
        expect(days).toBeLessThan(50 * 2);
      }
    }
  });

  it('deeper injections stay longer, in the tropics and the extratropics (IPCC 1999 ch. 4: 1-2 years at 16-20 km)', () => {
    for (const lat of [0, 45, -60]) {
      let last = 0;
      for (const d of [0, 1, 2, 4, 6, 9]) {
        const y = residenceTimeYears(d, rt, lat);
        expect(y).toBeGreaterThanOrEqual(last);
        last = y;
      }
    }
    expect(residenceTimeYears(6, rt, 45)).toBeGreaterThanOrEqual(1);
    expect(residenceTimeYears(9, rt, 45)).toBeLessThanOrEqual(2);
  });

  it('stays within the physical bound of about 5 years (mean age of stratospheric air, Waugh & Hall 2002)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -5, max: 40, noNaN: true }),
        fc.double({ min: -90, max: 90, noNaN: true }),
        (d, lat) => {
          const y = residenceTimeYears(d, rt, lat) * rt.highFactor;
          expect(y).toBeLessThanOrEqual(6);
          expect(y).toBeGreaterThan(0);
        },
      ),
    );
  });
});

describe('local odd-oxygen loss budget', () => {
  const at = (h: number) => {
    const s = isa(h);
    return oddOxygenBudget({
      altitudeM: h,
      latitudeDeg: 45,
      profileSlot: slot('midlatitude-summer'),
      aboveTropopause: true,
      temperatureK: s.temperatureK,
      airDensityCm3: s.numberDensityCm3,
      o3Ppmv: ozonePpmv(slot('midlatitude-summer'), h / 1000),
      inputs: DEFAULT_OZONE_INPUTS,
    });
  };

  it('HOx cycles outweigh the Chapman loss in the lowermost stratosphere, 11-18 km (common knowledge, from memory: Wennberg et al. 1994)', () => {
    for (const h of [11_000, 14_000, 18_000]) {
      const b = at(h);
      expect(b.hoxLossCm3S).toBeGreaterThan(b.chapmanLossCm3S);
    }
  });

  it('the Chapman share grows with altitude (common knowledge)', () => {
    const low = at(12_000);
    const high = at(20_000);
    expect(high.chapmanLossCm3S / high.hoxLossCm3S).toBeGreaterThan(low.chapmanLossCm3S / low.hoxLossCm3S);
  });

  it('shares are fractions', () => {
    const b = at(17_000);
    expect(b.addedNoxShareAt1Ppbv).toBeGreaterThan(0);
    expect(b.addedNoxShareAt1Ppbv).toBeLessThan(1);
  });

  it('a zero ozone profile gives a zero share, not NaN', () => {
    const s = isa(17_000);
    const b = oddOxygenBudget({
      altitudeM: 17_000,
      latitudeDeg: 45,
      profileSlot: 0,
      aboveTropopause: true,
      temperatureK: s.temperatureK,
      airDensityCm3: s.numberDensityCm3,
      o3Ppmv: 0,
      inputs: DEFAULT_OZONE_INPUTS,
    });
    expect(b.addedNoxShareAt1Ppbv).toBe(0);
  });
});

describe('fleet-scale column context (Eastham et al. 2022; Zhang et al. 2023)', () => {
  it('reproduces Eastham et al. 2022 at its own point: 170 Gg NOx/yr at 15-17 km -> -0.046 % column, +/-50 %', () => {
    const [eastham, zhang] = fleetOzoneColumnContext([{ geometricAltitudeKm: 16, noxKgPerYear: 170e6 }]);
    expect(eastham.applicable).toBe(true);
    expect(eastham.citation).toMatch(/all of the fleet's emissions.*not NOx alone/);
    expect(eastham.columnChangePct!.central).toBeCloseTo(-0.046, 9);
    expect(eastham.columnChangePct!.low).toBeCloseTo(-0.023, 9);
    expect(eastham.columnChangePct!.high).toBeCloseTo(-0.069, 9);
    expect(zhang.applicable).toBe(false);
    expect(zhang.columnChangePct).toBeNull();
  });

  it('reproduces Zhang et al. 2023 at its own point: 1.78 Tg NOx/yr at 17-20 km -> -0.74 %', () => {
    const [, zhang] = fleetOzoneColumnContext([{ geometricAltitudeKm: 18.5, noxKgPerYear: 1.78e9 }]);
    expect(zhang.columnChangePct!.central).toBeCloseTo(-0.74, 9);
  });

  it('is not applicable outside the studies altitudes and never extrapolates', () => {
    const ctx = fleetOzoneColumnContext([{ geometricAltitudeKm: 11, noxKgPerYear: 1e9 }]);
    for (const c of ctx) {
      expect(c.applicable).toBe(false);
      expect(c.columnChangePct).toBeNull();
      expect(c.note).toMatch(/Not applicable/);
    }
  });
});
