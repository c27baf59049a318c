import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  ScreeningInputError,
  climatologicalTropopauseForDayM,
  climatologicalTropopauseM,
  isa,
  tropopauseFromSounding,
} from '@/lib/screening';

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

describe('climatological tropopause (Mateus, Mendes & Pires 2022)', () => {
  // Common practice: tropics 16-17 km, mid-latitudes 10-12 km, polar 8-9 km. The model's RMSE
  // against radiosondes is about 0.9 km, so each range is widened by 0.5 km either side.
  const tol = 500;
  it.each([
    { lat: 0, lo: 16_000, hi: 17_000 },
    { lat: 10, lo: 16_000, hi: 17_000 },
    { lat: -10, lo: 16_000, hi: 17_000 },
    { lat: 45, lo: 10_000, hi: 12_000 },
    { lat: -45, lo: 10_000, hi: 12_000 },
    { lat: 80, lo: 8_000, hi: 9_000 },
    { lat: -80, lo: 8_000, hi: 9_000 },
  ])('latitude $lat: within the common-practice range $lo-$hi m +/- 0.5 km', ({ lat, lo, hi }) => {
    for (const month of [null, 1, 4, 7, 10]) {
      const h = climatologicalTropopauseM(lat, month);
      expect(h).toBeGreaterThan(lo - tol);
      expect(h).toBeLessThan(hi + tol);
    }
  });

  it('is lower in northern mid-latitude winter than in summer (common practice)', () => {
    expect(climatologicalTropopauseM(45, 1)).toBeLessThan(climatologicalTropopauseM(45, 7));
  });

  it('converts the geometric model height to geopotential: H = r0 Z / (r0 + Z), about Z^2 / r0 lower (ICAO Doc 7488/3 r0)', () => {
    // The Mateus, Mendes & Pires (2022) model, annual mean, evaluated independently here.
    const a = [8.499, 7.8229, 26.7284, -1.5804, 0.098];
    const zKm = a[0] + a[1] / Math.pow(1 + Math.exp(-(30 - a[2]) / a[3]), a[4]);
    const z = zKm * 1000;
    expect(climatologicalTropopauseM(30, null)).toBeCloseTo((6_356_766 * z) / (6_356_766 + z), 6);
  });

  it("equals the authors' published code (sth_model.py, 3.5 PVU rows) in both hemispheres, with the seasonal term", () => {
    // Source: Mateus, Mendes & Pires (2022), Remote Sens. 14, 4303; coefficients and formula as in the
    // authors' released sth_model.py: z = a0 + a1 / (1 + exp(-(lat - a2) / a3))^a4 + a5 cos(2 pi (doy - 28) / 365.25),
    // southern set for lat <= 0. Geometric km, converted here to geopotential (ICAO Doc 7488/3 r0).
    const NH = [8.499, 7.8229, 26.7284, -1.5804, 0.098, -0.1257];
    const SH = [8.7796, 7.5417, -26.73, 1.1474, 0.087, -0.1255];
    const sth = (lat: number, doy: number) => {
      const a = lat <= 0 ? SH : NH;
      return a[0] + a[1] / Math.pow(1 + Math.exp(-(lat - a[2]) / a[3]), a[4]) + a[5] * Math.cos(((2 * Math.PI) / 365.25) * (doy - 28));
    };
    for (const lat of [-85, -60, -38.7, -20, 0, 15, 38.5519, 52, 75]) {
      for (const doy of [1, 28, 150, 210, 366]) {
        const z = sth(lat, doy) * 1000;
        expect(climatologicalTropopauseForDayM(lat, doy), `${lat}° day ${doy}`).toBeCloseTo((6_356_766 * z) / (6_356_766 + z), 6);
      }
    }
  });

  it('annual mean equals the mean over the twelve months to within 10 m (the cosine term averages out)', () => {
    for (const lat of [-60, -20, 0, 35, 70]) {
      let s = 0;
      for (let m = 1; m <= 12; m++) s += climatologicalTropopauseM(lat, m);
      expect(Math.abs(s / 12 - climatologicalTropopauseM(lat, null))).toBeLessThan(10);
    }
  });

  it('falls from the equator to the poles in each hemisphere (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 89, noNaN: true }), fc.double({ min: 0.01, max: 1, noNaN: true }), (lat, d) => {
        expect(climatologicalTropopauseM(Math.min(90, lat + d), null)).toBeLessThan(climatologicalTropopauseM(lat, null));
        expect(climatologicalTropopauseM(-Math.min(90, lat + d), null)).toBeLessThan(climatologicalTropopauseM(-lat, null));
      }),
    );
  });

  it('uses the mid-month day of year for a month', () => {
    expect(climatologicalTropopauseM(50, 1)).toBeCloseTo(climatologicalTropopauseForDayM(50, 16), 9);
  });

  it('rejects bad arguments', () => {
    expect(() => climatologicalTropopauseM(91, null)).toThrow(RangeError);
    expect(() => climatologicalTropopauseM(10, 13)).toThrow(RangeError);
    expect(() => climatologicalTropopauseM(10, 0)).toThrow(RangeError);
  });
});

describe('WMO (1957) lapse-rate tropopause of constructed soundings', () => {
  // An ISA-like profile: 6.5 K/km up to 11 km, isothermal above. By the WMO definition the
  // tropopause is the 11 km level, where the lapse rate first falls to 2 K/km or less.
  const isaLike = sounding([{ fromM: 0, lapseKPerKm: 6.5 }, { fromM: 11_000, lapseKPerKm: 0 }], 20_000, 500);

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
    const levels = sounding([{ fromM: 0, lapseKPerKm: 6.5 }, { fromM: 9000, lapseKPerKm: 1.0 }], 16_000, 1000);
    expect(tropopauseFromSounding(levels)!.altitudeM).toBeCloseTo(9000, 6);
  });

  it('counts a lapse rate of exactly 2 K/km ("2 K/km or less")', () => {
    const levels = sounding([{ fromM: 0, lapseKPerKm: 6.5 }, { fromM: 10_000, lapseKPerKm: 2 }], 16_000, 1000);
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
    { name: 'duplicate altitude', levels: [...good, { altitudeM: 11_000, temperatureK: 210 }], path: 'levels.3.altitudeM' },
    { name: 'duplicate pressure', levels: [{ pressureHpa: 300, temperatureK: 230 }, { pressureHpa: 200, temperatureK: 220 }, { pressureHpa: 300, temperatureK: 225 }], path: 'levels.2.pressureHpa' },
    { name: 'temperature at 100 K or below', levels: [good[0], { altitudeM: 11_000, temperatureK: 90 }, good[2]], path: 'levels.1.temperatureK' },
    { name: 'temperature in Celsius', levels: [good[0], good[1], { altitudeM: 14_000, temperatureK: -56.5 }], path: 'levels.2.temperatureK' },
    { name: 'temperature of 350 K or more', levels: [{ altitudeM: 0, temperatureK: 360 }, good[1], good[2]], path: 'levels.0.temperatureK' },
    { name: 'pressure of 0', levels: [{ pressureHpa: 0, temperatureK: 250 }, good[1], good[2]], path: 'levels.0.pressureHpa' },
    { name: 'negative pressure', levels: [good[0], good[1], { pressureHpa: -3, temperatureK: 216 }], path: 'levels.2.pressureHpa' },
    { name: 'neither altitude nor pressure', levels: [good[0], { temperatureK: 216 }, good[2]], path: 'levels.1' },
    { name: 'pressure rising with altitude', levels: [{ altitudeM: 9000, pressureHpa: 200, temperatureK: 229 }, { altitudeM: 11_000, pressureHpa: 300, temperatureK: 216 }, good[2]], path: 'levels.1.pressureHpa' },
    { name: 'not a list', levels: { altitudeM: 1 }, path: 'levels' },
    { name: 'a level that is not an object', levels: [good[0], 5, good[2]], path: 'levels.1' },
  ])('$name -> ScreeningInputError at $path', ({ levels, path }) => {
    expect(pathsOf(levels)).toContain(path);
  });
});
