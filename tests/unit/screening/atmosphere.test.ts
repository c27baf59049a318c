import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  flightLevelToMetres,
  geometricFromGeopotentialM,
  geopotentialFromGeometricM,
  isa,
  pressureAltitudeM,
} from '@/lib/screening';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('isa against the published tables', () => {
  // ICAO Doc 7488/3 (= US Standard Atmosphere 1976) layer bases, geopotential altitude. The engine
  // derives each base pressure from p0 by continuity, so these are independent checks.
  it.each([
    {
      h: 0,
      t: 288.15,
      p: 101_325,
      rho: 1.225,
      a: 340.294,
      source: 'ICAO Doc 7488/3 sea level: 288.15 K, 101 325 Pa, 1.225 kg/m3, 340.294 m/s',
    },
    {
      h: 11_000,
      t: 216.65,
      p: 22_632.06,
      rho: 0.36392,
      a: 295.07,
      source: 'ICAO Doc 7488/3 table: 11 000 m -> 216.65 K, 22 632 Pa',
    },
    {
      h: 20_000,
      t: 216.65,
      p: 5474.889,
      rho: 0.088035,
      a: 295.07,
      source: 'ICAO Doc 7488/3 table: 20 000 m -> 216.65 K, 5474.889 Pa',
    },
    {
      h: 32_000,
      t: 228.65,
      p: 868.0187,
      rho: 0.013225,
      a: 303.13,
      source: 'ICAO Doc 7488/3 table: 32 000 m -> 228.65 K, 868.0187 Pa',
    },
  ])('$source', ({ h, t, p, rho, a }) => {
    const s = isa(h);
    expect(s.temperatureK).toBeCloseTo(t, 6);
    // 1e-5: the standard rounds R (287.05287 vs 8314.32/28.9644) and its tabulated pressures.
    expect(rel(s.pressurePa, p)).toBeLessThan(1e-5);
    expect(rel(s.densityKgM3, rho)).toBeLessThan(1e-4);
    expect(rel(s.speedOfSoundMs, a)).toBeLessThan(1e-4);
  });

  // US Standard Atmosphere 1976, Table I by geometric altitude (from memory, 5 significant digits).
  it.each([
    { z: 1000, t: 281.651, p: 89_876 },
    { z: 5000, t: 255.676, p: 54_048 },
    { z: 10_000, t: 223.252, p: 26_500 },
    { z: 15_000, t: 216.65, p: 12_111 },
    { z: 25_000, t: 221.552, p: 2549.2 },
    { z: 30_000, t: 226.509, p: 1197.0 },
  ])('US Standard Atmosphere 1976 (from memory): geometric $z m -> $t K, $p Pa', ({ z, t, p }) => {
    const s = isa(geopotentialFromGeometricM(z));
    expect(Math.abs(s.temperatureK - t)).toBeLessThan(0.002);
    expect(rel(s.pressurePa, p)).toBeLessThan(1e-4);
  });

  it('number density at sea level is the Loschmidt-like 2.547e19 cm^-3 (p0 / (kB T0), US Standard Atmosphere 1976)', () => {
    expect(rel(isa(0).numberDensityCm3, 2.547e19)).toBeLessThan(1e-3);
  });
});

describe('flight levels', () => {
  it('FL x 30.48 m (1 ft = 0.3048 m exactly, international foot)', () => {
    expect(flightLevelToMetres(350)).toBeCloseTo(10_668, 9);
    expect(flightLevelToMetres(0)).toBe(0);
    expect(flightLevelToMetres(660)).toBeCloseTo(20_116.8, 9);
  });

  it('the ISA tropopause (11 000 m) is about FL361 (ICAO Doc 7488/3 layer base; FL = ft / 100)', () => {
    expect(flightLevelToMetres(360)).toBeLessThan(11_000);
    expect(flightLevelToMetres(361)).toBeGreaterThan(11_000);
  });

  it('FL300 is about 300 hPa and FL390 about 197 hPa (common practice, from memory)', () => {
    expect(Math.abs(isa(flightLevelToMetres(300)).pressurePa / 100 - 300.9)).toBeLessThan(0.5);
    expect(Math.abs(isa(flightLevelToMetres(390)).pressurePa / 100 - 196.8)).toBeLessThan(0.5);
  });
});

describe('pressure altitude', () => {
  it('inverts isa at the 11 km layer base (ICAO Doc 7488/3: 22 632.06 Pa)', () => {
    expect(Math.abs(pressureAltitudeM(22_632.06) - 11_000)).toBeLessThan(0.01);
  });

  it('is the inverse of isa over -500..32 000 m (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -500, max: 32_000, noNaN: true }), (h) => {
        expect(Math.abs(pressureAltitudeM(isa(h).pressurePa) - h)).toBeLessThan(1e-6 * Math.max(1, Math.abs(h)) + 1e-6);
      }),
    );
  });

  it('pressure falls strictly with altitude (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -500, max: 31_999, noNaN: true }),
        fc.double({ min: 0.5, max: 1000, noNaN: true }),
        (h, dh) => {
          const h2 = Math.min(32_000, h + dh);
          expect(isa(h2).pressurePa).toBeLessThan(isa(h).pressurePa);
        },
      ),
    );
  });

  it('geometric and geopotential conversions invert each other (H = r0 Z / (r0 + Z), r0 = 6 356 766 m, ICAO Doc 7488/3)', () => {
    expect(geopotentialFromGeometricM(20_000)).toBeCloseTo((6_356_766 * 20_000) / (6_356_766 + 20_000), 9);
    expect(geometricFromGeopotentialM(geopotentialFromGeometricM(17_000))).toBeCloseTo(17_000, 6);
  });
});

describe('range errors', () => {
  it.each([-501, 32_001, Number.NaN, Number.POSITIVE_INFINITY])('isa(%s) throws RangeError', (h) => {
    expect(() => isa(h)).toThrow(RangeError);
  });
  it.each([800, 200_000, 0, -5, Number.NaN])('pressureAltitudeM(%s) throws RangeError', (p) => {
    expect(() => pressureAltitudeM(p)).toThrow(RangeError);
  });
  it('flightLevelToMetres beyond 32 000 m throws RangeError', () => {
    expect(() => flightLevelToMetres(1100)).toThrow(RangeError);
  });
  it('accepts the ends of the range', () => {
    expect(() => isa(-500)).not.toThrow();
    expect(() => isa(32_000)).not.toThrow();
  });
});
