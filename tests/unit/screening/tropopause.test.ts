import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  ScreeningInputError,
  climatologicalTropopause,
  climatologicalTropopauseForDayM,
  climatologicalTropopauseM,
  isa,
  pressureAltitudeM,
  tropopauseFromSounding,
} from '@/lib/screening';
import { mateusSigmoidKm } from '@/lib/screening/tropopause';

type Level = { altitudeM?: number; pressureHpa?: number; temperatureK: number };

/** Piecewise-linear temperature profile from (altitude m, lapse K/km) breakpoints, with hydrostatic pressures. */
function sounding(breaks: { fromM: number; lapseKPerKm: number }[], topM: number, stepM: number, t0 = 288.15): Level[] {
  const out: Level[] = [];
  let t = t0;
  let p = 101_325;
  let prevT = t0;
  for (let z = 0; z <= topM + 1e-9; z += stepM) {
    if (z > 0) {
      const lapse = [...breaks].reverse().find((b) => z - stepM >= b.fromM - 1e-9)?.lapseKPerKm ?? 6.5;
      t = prevT - (lapse * stepM) / 1000;
      const tm = 0.5 * (t + prevT);
      p = p * Math.exp((-9.80665 * stepM) / (287.05287 * tm));
    }
    out.push({ altitudeM: z, pressureHpa: p / 100, temperatureK: t });
    prevT = t;
  }
  return out;
}

describe('climatological tropopause (Mateus, Mendes & Pires 2022, lookup-table model, 3.5 PVU)', () => {
  // Common practice: tropics 16-17 km, mid-latitudes 10-12 km, polar 8-9 km. The model's RMSE
  // against radiosondes is about 0.7 km, so each range is widened by 0.7 km either side; polar
  // winter tropopauses are ill-defined and higher (over Antarctica near 10 km), so 1 km there.
  it.each([
    { lat: 0, lo: 16_000, hi: 17_000, tol: 700 },
    { lat: 10, lo: 16_000, hi: 17_000, tol: 700 },
    { lat: -10, lo: 16_000, hi: 17_000, tol: 700 },
    { lat: 45, lo: 10_000, hi: 12_000, tol: 700 },
    { lat: -45, lo: 10_000, hi: 12_000, tol: 700 },
    { lat: 80, lo: 8_000, hi: 9_000, tol: 1000 },
    { lat: -80, lo: 8_000, hi: 9_000, tol: 1000 },
  ])('latitude $lat: within the common-practice range $lo-$hi m (+/- $tol m)', ({ lat, lo, hi, tol }) => {
    for (const month of [null, 1, 4, 7, 10]) {
      const h = climatologicalTropopauseM(lat, month);
      expect(h).toBeGreaterThan(lo - tol);
      expect(h).toBeLessThan(hi + tol);
    }
  });

  // Values of the authors' 3.5 PVU table (array Tpvu35 of bth_model.py in pjmateus/global_tropopause_model,
  // published with Mateus, Mendes & Pires 2022): rows are the days 16 + k x 334/11, columns the bands.
  // Geometric km; the function returns geopotential m (H = r0 Z / (r0 + Z), ICAO Doc 7488/3 r0).
  const gp = (km: number) => (6_356_766 * km * 1000) / (6_356_766 + km * 1000);
  it.each([
    { lat: 45, day: 16, km: 10.099, what: '45N, mid-January' },
    { lat: 45, day: 16 + (6 * 334) / 11, km: 12.236, what: '45N, mid-July row' },
    { lat: -45, day: 16, km: 11.333, what: '45S, mid-January' },
    { lat: -45, day: 16 + (6 * 334) / 11, km: 10.422, what: '45S, mid-July row' },
    { lat: 0, day: 16 + (4 * 334) / 11, km: 16.462, what: 'equator, May row' },
    { lat: 32.5, day: 16 + (3 * 334) / 11, km: 12.879, what: '32.5N, April row' },
    { lat: -85, day: 16 + (8 * 334) / 11, km: 9.831, what: '85S, September row' },
    { lat: 75, day: 350, km: 8.821, what: '75N, December row' },
  ])("equals the authors' published table at $what ($km km)", ({ lat, day, km }) => {
    expect(climatologicalTropopauseForDayM(lat, day)).toBeCloseTo(gp(km), 6);
  });

  it('interpolates bilinearly between the published nodes (50N mid-January: halfway between 10.099 and 9.457 km of the 45N and 55N bands)', () => {
    expect(climatologicalTropopauseForDayM(50, 16)).toBeCloseTo(gp((10.099 + 9.457) / 2), 6);
    // Across the year end: day 365.5 lies halfway between the December (350) and January (16 + 365) rows at 45N.
    expect(climatologicalTropopauseForDayM(45, 365.5)).toBeCloseTo(gp((10.361 + 10.099) / 2), 6);
  });

  it('summer is above winter at mid-latitudes in both hemispheres, by a realistic 0.8-4 km (each in its own season; SCIENCE.md: 45N about 10.1 km in January and 12.2 km in July, 45S about 11.3 and 10.4 km)', () => {
    fc.assert(
      fc.property(fc.double({ min: 35, max: 45, noNaN: true }), (lat) => {
        const north = climatologicalTropopauseM(lat, 7) - climatologicalTropopauseM(lat, 1);
        const south = climatologicalTropopauseM(-lat, 1) - climatologicalTropopauseM(-lat, 7);
        for (const d of [north, south]) {
          expect(d).toBeGreaterThan(800);
          expect(d).toBeLessThan(4000);
        }
      }),
    );
  });

  it('annual mean is the mean of the twelve rows (within 100 m of the mean over the calendar months)', () => {
    for (const lat of [-60, -20, 0, 35, 70]) {
      let s = 0;
      for (let m = 1; m <= 12; m++) s += climatologicalTropopauseM(lat, m);
      expect(Math.abs(s / 12 - climatologicalTropopauseM(lat, null))).toBeLessThan(100);
    }
  });

  it('annual mean does not rise from the equator towards either pole (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 89, noNaN: true }),
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        (lat, d) => {
          expect(climatologicalTropopauseM(Math.min(90, lat + d), null)).toBeLessThanOrEqual(
            climatologicalTropopauseM(lat, null) + 1e-9,
          );
          expect(climatologicalTropopauseM(-Math.min(90, lat + d), null)).toBeLessThanOrEqual(
            climatologicalTropopauseM(-lat, null) + 1e-9,
          );
        },
      ),
    );
  });

  it('uses the mid-month day of year for a month', () => {
    expect(climatologicalTropopauseM(50, 1)).toBeCloseTo(climatologicalTropopauseForDayM(50, 16), 9);
  });

  it('in a cold column the tropopause pressure is below the ISA pressure at the same height (subarctic winter: a higher pressure altitude); in the warm tropical column the reverse (SCIENCE.md section 3)', () => {
    for (const lat of [60, 70, 80, -65]) {
      const winter = lat > 0 ? 1 : 7;
      const tp = climatologicalTropopause(lat, winter);
      const h = (6_356_766 * tp.geometricHeightM) / (6_356_766 + tp.geometricHeightM);
      expect(tp.pressureHpa * 100).toBeLessThan(isa(h).pressurePa);
      expect(tp.pressureAltitudeM - h).toBeGreaterThan(200);
      expect(tp.pressureAltitudeM - h).toBeLessThan(1200);
    }
    const trop = climatologicalTropopause(0, 1);
    const ht = (6_356_766 * trop.geometricHeightM) / (6_356_766 + trop.geometricHeightM);
    expect(trop.pressureHpa * 100).toBeGreaterThan(isa(ht).pressurePa);
  });

  it('places the height in the AFGL 1986 column: 45N January, 10.099 km, lies between the midlatitude-winter 10 and 11 km levels (256.8 and 219.9 hPa, AFGL-TR-86-0110 table 1c)', () => {
    const tp = climatologicalTropopause(45, 1);
    expect(tp.geometricHeightM).toBeCloseTo(10_099, 6);
    expect(tp.pressureHpa).toBeLessThan(256.8);
    expect(tp.pressureHpa).toBeGreaterThan(219.9);
    // ln p linear in height between the two tabulated levels.
    expect(tp.pressureHpa).toBeCloseTo(Math.exp(Math.log(256.8) + 0.099 * (Math.log(219.9) - Math.log(256.8))), 6);
    expect(tp.pressureAltitudeM).toBeCloseTo(pressureAltitudeM(tp.pressureHpa * 100), 6);
  });

  it("the sigmoid model kept for comparison equals the authors' published sth_model.py (3.5 PVU rows, both hemispheres)", () => {
    const NH = [8.499, 7.8229, 26.7284, -1.5804, 0.098, -0.1257];
    const SH = [8.7796, 7.5417, -26.73, 1.1474, 0.087, -0.1255];
    for (const lat of [-60, -20, 0, 38.5519, 75]) {
      for (const doy of [1, 150]) {
        const a = lat <= 0 ? SH : NH;
        const z =
          a[0] +
          a[1] / Math.pow(1 + Math.exp(-(lat - a[2]) / a[3]), a[4]) +
          a[5] * Math.cos(((2 * Math.PI) / 365.25) * (doy - 28));
        expect(mateusSigmoidKm(lat, doy)).toBeCloseTo(z, 9);
      }
    }
  });

  it('rejects bad arguments', () => {
    expect(() => climatologicalTropopauseM(91, null)).toThrow(RangeError);
    expect(() => climatologicalTropopauseM(10, 13)).toThrow(RangeError);
    expect(() => climatologicalTropopauseM(10, 0)).toThrow(RangeError);
    expect(() => climatologicalTropopause(10, 13)).toThrow(RangeError);
  });
});

describe('WMO (1957) lapse-rate tropopause of constructed soundings', () => {
  // An ISA-like profile: 6.5 K/km up to 11 km, isothermal above. By the WMO definition the
  // tropopause is the 11 km level, where the lapse rate first falls to 2 K/km or less.
  const isaLike = sounding(
    [
      { fromM: 0, lapseKPerKm: 6.5 },
      { fromM: 11_000, lapseKPerKm: 0 },
    ],
    20_000,
    500,
  );

  it('finds 11 km, 216.65 K and ISA 226.3 hPa on an ISA-like sounding (ICAO Doc 7488/3 values)', () => {
    const tp = tropopauseFromSounding(isaLike);
    expect(tp).not.toBeNull();
    expect(tp!.altitudeM).toBeCloseTo(11_000, 6);
    expect(tp!.temperatureK).toBeCloseTo(216.65, 6);
    expect(Math.abs(tp!.pressureHpa - isa(11_000).pressurePa / 100)).toBeLessThan(0.5);
  });

  it('does not count a stable layer thinner than 2 km (the 2 km average condition)', () => {
    const levels = sounding(
      [
        { fromM: 0, lapseKPerKm: 6.5 },
        { fromM: 8000, lapseKPerKm: 0 },
        { fromM: 9000, lapseKPerKm: 6.5 },
        { fromM: 12_000, lapseKPerKm: 0 },
      ],
      20_000,
      500,
    );
    const tp = tropopauseFromSounding(levels);
    expect(tp!.altitudeM).toBeCloseTo(12_000, 6);
  });

  it('takes a stable layer of 2 km and more that stays stable', () => {
    const levels = sounding(
      [
        { fromM: 0, lapseKPerKm: 6.5 },
        { fromM: 9000, lapseKPerKm: 1.0 },
      ],
      16_000,
      1000,
    );
    expect(tropopauseFromSounding(levels)!.altitudeM).toBeCloseTo(9000, 6);
  });

  it('counts a lapse rate of exactly 2 K/km ("2 K/km or less")', () => {
    const levels = sounding(
      [
        { fromM: 0, lapseKPerKm: 6.5 },
        { fromM: 10_000, lapseKPerKm: 2 },
      ],
      16_000,
      1000,
    );
    expect(tropopauseFromSounding(levels)!.altitudeM).toBeCloseTo(10_000, 6);
  });

  it('ignores a stable layer below 500 hPa (search above 500 hPa, operational practice)', () => {
    const levels = sounding(
      [
        { fromM: 0, lapseKPerKm: -3 },
        { fromM: 1500, lapseKPerKm: 6.5 },
        { fromM: 11_000, lapseKPerKm: 0 },
      ],
      18_000,
      500,
    );
    expect(tropopauseFromSounding(levels)!.altitudeM).toBeCloseTo(11_000, 6);
  });

  it('gives the same answer for unsorted levels', () => {
    const shuffled = [...isaLike];
    const rnd = fc.sample(fc.integer({ min: 0, max: 1_000_000 }), { numRuns: shuffled.length, seed: 7 });
    shuffled.sort((a, b) => rnd[(a.altitudeM ?? 0) % rnd.length] - rnd[(b.altitudeM ?? 0) % rnd.length]);
    expect(shuffled[0].altitudeM).not.toBe(0);
    expect(tropopauseFromSounding(shuffled)).toEqual(tropopauseFromSounding(isaLike));
  });

  it('works from pressure-only levels (hypsometric altitudes anchored on ISA), within 20 m', () => {
    const pressureOnly = isaLike.map((l) => ({ pressureHpa: l.pressureHpa, temperatureK: l.temperatureK })).reverse();
    const tp = tropopauseFromSounding(pressureOnly)!;
    expect(Math.abs(tp.altitudeM - 11_000)).toBeLessThan(20);
    expect(tp.temperatureK).toBeCloseTo(216.65, 6);
  });

  it('works from altitude-only levels', () => {
    const altitudeOnly = isaLike.map((l) => ({ altitudeM: l.altitudeM, temperatureK: l.temperatureK }));
    const tp = tropopauseFromSounding(altitudeOnly)!;
    expect(tp.altitudeM).toBeCloseTo(11_000, 6);
    expect(Math.abs(tp.pressureHpa - 226.3)).toBeLessThan(1);
  });

  it('returns null when the lapse rate never falls to 2 K/km', () => {
    expect(tropopauseFromSounding(sounding([{ fromM: 0, lapseKPerKm: 6.5 }], 15_000, 1000))).toBeNull();
  });
});

describe('WMO (1957): the 2 km condition needs 2 km of sounding', () => {
  it('a candidate with less than 2 km of sounding above it is not accepted (null: the engine falls back to the climatology with a caution)', () => {
    const isaLike = sounding(
      [
        { fromM: 0, lapseKPerKm: 6.5 },
        { fromM: 11_000, lapseKPerKm: 0 },
      ],
      12_500,
      500,
    );
    expect(tropopauseFromSounding(isaLike)).toBeNull();
    const longer = sounding(
      [
        { fromM: 0, lapseKPerKm: 6.5 },
        { fromM: 11_000, lapseKPerKm: 0 },
      ],
      13_500,
      500,
    );
    expect(tropopauseFromSounding(longer)?.altitudeM).toBeCloseTo(11_000, 6);
  });
});

describe('sounding errors', () => {
  const good: Level[] = [
    { altitudeM: 9000, temperatureK: 229.65 },
    { altitudeM: 11_000, temperatureK: 216.65 },
    { altitudeM: 14_000, temperatureK: 216.65 },
  ];
  const pathsOf = (levels: unknown): string[] => {
    try {
      tropopauseFromSounding(levels as Level[]);
    } catch (e) {
      expect(e).toBeInstanceOf(ScreeningInputError);
      return (e as ScreeningInputError).fields.map((f) => f.path);
    }
    throw new Error('expected a ScreeningInputError');
  };

  it.each([
    { name: 'fewer than 3 levels', levels: good.slice(0, 2), path: 'levels' },
    {
      name: 'duplicate altitude',
      levels: [...good, { altitudeM: 11_000, temperatureK: 210 }],
      path: 'levels.3.altitudeM',
    },
    {
      name: 'duplicate pressure',
      levels: [
        { pressureHpa: 300, temperatureK: 230 },
        { pressureHpa: 200, temperatureK: 220 },
        { pressureHpa: 300, temperatureK: 225 },
      ],
      path: 'levels.2.pressureHpa',
    },
    {
      name: 'temperature at 100 K or below',
      levels: [good[0], { altitudeM: 11_000, temperatureK: 90 }, good[2]],
      path: 'levels.1.temperatureK',
    },
    {
      name: 'temperature in Celsius',
      levels: [good[0], good[1], { altitudeM: 14_000, temperatureK: -56.5 }],
      path: 'levels.2.temperatureK',
    },
    {
      name: 'temperature of 350 K or more',
      levels: [{ altitudeM: 0, temperatureK: 360 }, good[1], good[2]],
      path: 'levels.0.temperatureK',
    },
    {
      name: 'pressure of 0',
      levels: [{ pressureHpa: 0, temperatureK: 250 }, good[1], good[2]],
      path: 'levels.0.pressureHpa',
    },
    {
      name: 'negative pressure',
      levels: [good[0], good[1], { pressureHpa: -3, temperatureK: 216 }],
      path: 'levels.2.pressureHpa',
    },
    { name: 'neither altitude nor pressure', levels: [good[0], { temperatureK: 216 }, good[2]], path: 'levels.1' },
    {
      name: 'pressure rising with altitude',
      levels: [
        { altitudeM: 9000, pressureHpa: 200, temperatureK: 229 },
        { altitudeM: 11_000, pressureHpa: 300, temperatureK: 216 },
        good[2],
      ],
      path: 'levels.1.pressureHpa',
    },
    { name: 'not a list', levels: { altitudeM: 1 }, path: 'levels' },
    { name: 'a level that is not an object', levels: [good[0], 5, good[2]], path: 'levels.1' },
  ])('$name -> ScreeningInputError at $path', ({ levels, path }) => {
    expect(pathsOf(levels)).toContain(path);
  });
});
