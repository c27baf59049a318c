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

  it('a window average lies between the extremes of its days, and a whole year equals the annual mean (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -90, max: 90, noNaN: true }), fc.integer({ min: 1, max: 365 }), (lat, day) => {
        const year = windowSunlight(lat, day, 1);
        const annual = windowSunlight(lat, null, 1);
        expect(year.meanCosZenith).toBeCloseTo(annual.meanCosZenith, 3);
        expect(year.dayFraction).toBeCloseTo(annual.dayFraction, 3);
        const w = windowSunlight(lat, day, 0.1);
        expect(w.dayFraction).toBeGreaterThanOrEqual(0);
        expect(w.dayFraction).toBeLessThanOrEqual(1 + 1e-12);
        expect(w.daytimeCosZenith).toBeLessThanOrEqual(1 + 1e-9);
        expect(Number.isFinite(w.daytimeCosZenith)).toBe(true);
      }),
    );
  });

  it('NOx emitted into the polar night meets sunlight only when it returns: a 0.1-year window from 21 December at 85N stays dark, a 1-year one does not', () => {
    expect(windowSunlight(85, 355, 0.1).dayFraction).toBe(0);
    expect(windowSunlight(85, 355, 1).dayFraction).toBeGreaterThan(0.4);
  });
});
