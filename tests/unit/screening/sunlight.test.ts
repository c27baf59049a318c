import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { daySunlight, solarDeclinationRad, windowSunlight } from '@/lib/screening';

const DEG = Math.PI / 180;

describe('solar geometry (Cooper 1969 declination; daily-mean cos zenith from the sunset hour angle)', () => {
  it('declination is about +23.45 degrees at the June solstice (day 172) and -23.45 at the December solstice (day 355), about 0 at the equinoxes (common knowledge)', () => {
    expect(solarDeclinationRad(172) / DEG).toBeCloseTo(23.45, 1);
    expect(solarDeclinationRad(355) / DEG).toBeCloseTo(-23.45, 1);
    expect(Math.abs(solarDeclinationRad(81) / DEG)).toBeLessThan(0.5);
  });

  it('at an equinox the day is 12 h everywhere off the poles, and the equator gets a daily-mean cos zenith of 1/pi (textbook, e.g. Hartmann, Global Physical Climatology, ch. 2)', () => {
    for (const lat of [-60, -20, 0, 35, 70]) expect(daySunlight(lat, 81).dayFraction).toBeCloseTo(0.5, 1);
    expect(daySunlight(0, 81).meanCosZenith).toBeCloseTo(1 / Math.PI, 2);
  });

  it('polar night: no sun at 80N in late December or at 80S in late June; polar day: the sun never sets in the opposite season', () => {
    expect(daySunlight(80, 355)).toEqual({ dayFraction: 0, meanCosZenith: 0 });
    expect(daySunlight(-80, 172)).toEqual({ dayFraction: 0, meanCosZenith: 0 });
    expect(daySunlight(80, 172).dayFraction).toBe(1);
    expect(daySunlight(-80, 355).dayFraction).toBe(1);
  });

  it('at the June solstice the North Pole gets more daily-mean sunlight than the equator: sin(23.45 deg) = 0.398 against about 0.29 (textbook insolation pattern)', () => {
    expect(daySunlight(90, 172).meanCosZenith).toBeCloseTo(Math.sin(23.45 * DEG), 2);
    expect(daySunlight(90, 172).meanCosZenith).toBeGreaterThan(daySunlight(0, 172).meanCosZenith);
  });

  it('weighted over the stay: each start day weighs its days by exp(-t/tau)/tau, checked against a day-by-day sum of the same geometry (first-order removal, tau the e-folding time; common practice)', () => {
    // Where no night is longer than 18 h nothing is converted, so the weighted sunlit fraction is
    // that of the geometry alone: sum over days of exp(-(n + 1/2)/tau) daySunlight, normalised.
    for (const [lat, day, tau] of [
      [45, 15, 0.3],
      [-30, 200, 1],
      [10, 100, 0.1],
      [50, 300, 2],
    ] as const) {
      let f = 0;
      let c = 0;
      let w = 0;
      for (let n = 0; n < 365 * 30; n++) {
        const e = Math.exp(-(n + 0.5) / (tau * 365));
        const s = daySunlight(lat, ((day - 1 + n) % 365) + 1);
        f += e * s.dayFraction;
        c += e * s.meanCosZenith;
        w += e;
      }
      const got = windowSunlight(lat, day, tau);
      expect(got.sunlitFraction).toBeCloseTo(f / w, 2);
      expect(got.dayFraction).toBeCloseTo(f / w, 2);
      expect(got.meanCosZenith).toBeCloseTo(c / w, 2);
      expect(got.activeShare).toBe(1);
    }
  });

  it('the mean over all start days equals the value without a date, and every value stays in its physical range (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -90, max: 90, noNaN: true }),
        fc.double({ min: 0.02, max: 8, noNaN: true }),
        fc.integer({ min: 1, max: 366 }),
        (lat, tau, day) => {
          let d = 0;
          let f = 0;
          for (let k = 1; k <= 365; k++) {
            const w = windowSunlight(lat, k, tau);
            d += w.dayFraction / 365;
            f += w.sunlitFraction / 365;
          }
          const annual = windowSunlight(lat, null, tau);
          expect(annual.dayFraction).toBeCloseTo(d, 2);
          expect(annual.sunlitFraction).toBeCloseTo(f, 2);
          const w = windowSunlight(lat, day, tau);
          expect(w.sunlitFraction).toBeGreaterThanOrEqual(0);
          expect(w.sunlitFraction).toBeLessThanOrEqual(1);
          expect(w.dayFraction).toBeLessThanOrEqual(w.sunlitFraction);
          expect(w.activeShare).toBeGreaterThanOrEqual(0);
          expect(w.activeShare).toBeLessThanOrEqual(1 + 1e-12);
          expect(w.daytimeCosZenith).toBeLessThanOrEqual(1);
          expect(Number.isFinite(w.daytimeCosZenith)).toBe(true);
        },
      ),
      { numRuns: 30 },
    );
  });

  it('NOx emitted into the polar night is mostly gone, or turned into HNO3, before the sun returns: at 85N from 21 December a 0.1-year stay sees almost no active sunlit time, a 1-year stay does', () => {
    const short = windowSunlight(85, 355, 0.1);
    expect(short.dayFraction).toBeLessThan(0.03);
    expect(short.activeShare).toBeLessThan(0.5);
    expect(windowSunlight(85, 355, 1).dayFraction).toBeGreaterThan(0.2);
  });

  it('dark conversion only where nights pass 18 h: the active share is 1 all year at 45N and 45S, and at 75N smaller for a 21 December emission than for a 21 June one (N2O5 hydrolysis in the dark, HNO3 back only in sunlight)', () => {
    for (const day of [1, 80, 172, 264, 355]) {
      expect(windowSunlight(45, day, 0.5).activeShare).toBe(1);
      expect(windowSunlight(-45, day, 0.5).activeShare).toBe(1);
    }
    expect(windowSunlight(75, 355, 0.5).activeShare).toBeLessThan(windowSunlight(75, 172, 0.5).activeShare);
    expect(windowSunlight(-75, 172, 0.5).activeShare).toBeLessThan(windowSunlight(-75, 355, 0.5).activeShare);
  });
});
