import { describe, expect, it } from 'vitest';
import { compareCruiseLevels, findAirport, screenFlight, ScreeningInputError } from '@/lib/screening';
import { getDistance } from 'geolib';
import { geolibDistanceM, planRoute, pointOnLeg } from '@/lib/screening/great-circle';
import { isoTimeMs } from '@/lib/validation/iso-time';

const BASE = { fuelBurnKg: 24_000, emission: { eiNoxGPerKg: 14 }, month: 1, mach: 0.84 };

/** `n` points evenly along the great circle from one airport to another, each at `fl`, with times at a steady speed when asked. */
function greatCircleTrack(from: string, to: string, n: number, fl: number, timed: boolean) {
  const a = findAirport(from)!;
  const b = findAirport(to)!;
  const plan = planRoute(Float64Array.of(a.lat, b.lat), Float64Array.of(a.lon, b.lon));
  const out: number[] = [0, 0];
  const t0 = Date.parse('2026-11-20T10:00:00Z');
  const speedKmS = 0.25; // about Mach 0.84 at FL370 (common practice: 250 m/s)
  return Array.from({ length: n }, (_, i) => {
    const km = (plan.totalKm * i) / (n - 1);
    pointOnLeg(plan, 0, km, out);
    return {
      lat: out[0],
      lon: out[1],
      flightLevel: fl,
      ...(timed ? { time: new Date(t0 + (km / speedKmS) * 1000).toISOString() } : {}),
    };
  });
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('screening a flown track', () => {
  it.each([
    ['without times', false],
    ['with times at a steady speed', true],
  ])('a great-circle track at one level gives the waypoint screening within 0.5 % (%s)', (_, timed) => {
    const byWaypoints = screenFlight({
      ...BASE,
      route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
      cruise: { flightLevel: 370 },
    });
    const byTrack = screenFlight({
      ...BASE,
      route: { track: { points: greatCircleTrack('EGLL', 'KJFK', 400, 370, timed) } },
    });
    expect(rel(byTrack.distanceKm, byWaypoints.distanceKm)).toBeLessThan(0.005);
    expect(rel(byTrack.fuelKg, byWaypoints.fuelKg)).toBeLessThan(0.005);
    expect(rel(byTrack.noxTotalKg, byWaypoints.noxTotalKg)).toBeLessThan(0.005);
    expect(rel(byTrack.noxAboveTropopauseKg, byWaypoints.noxAboveTropopauseKg)).toBeLessThan(0.005);
    expect(rel(byTrack.ozoneLoss.centralKg, byWaypoints.ozoneLoss.centralKg)).toBeLessThan(0.005);
    expect(byTrack.track).toMatchObject({ points: 400, levels: [370] });
  });

  it('fuel is spread by the time between points: a leg flown three times as long burns three times the fuel', () => {
    // Two equal 1-degree legs along the meridian (111.2 km each on the mean sphere), 10 and 30 minutes.
    const points = [
      { lat: 50, lon: 0, flightLevel: 350, time: '2026-11-20T10:00:00Z' },
      { lat: 51, lon: 0, flightLevel: 350, time: '2026-11-20T10:10:00Z' },
      { lat: 52, lon: 0, flightLevel: 350, time: '2026-11-20T10:40:00Z' },
    ];
    const r = screenFlight({ ...BASE, fuelBurnKg: 4000, route: { track: { points } } });
    const half = r.distanceKm / 2;
    const first = r.segments.filter((s) => s.endKm <= half + 1e-9).reduce((t, s) => t + s.fuelKg, 0);
    const second = r.segments.filter((s) => s.startKm >= half - 1e-9).reduce((t, s) => t + s.fuelKg, 0);
    expect(first).toBeCloseTo(1000, 6);
    expect(second).toBeCloseTo(3000, 6);
    expect(r.cruiseTimeH).toBeCloseTo(40 / 60, 12);
    expect(r.track?.durationS).toBe(2400);
  });

  it('per-point fuel flow: each leg burns the mean of its two ends over its time, and the sum replaces the entered total', () => {
    // Leg 1: 10 min at (3000 + 3600)/2 = 3300 kg/h -> 550 kg; leg 2: 30 min at (3600 + 2400)/2 = 3000 kg/h -> 1500 kg.
    const points = [
      { lat: 50, lon: 0, flightLevel: 350, time: '2026-11-20T10:00:00Z', fuelFlowKgH: 3000 },
      { lat: 51, lon: 0, flightLevel: 350, time: '2026-11-20T10:10:00Z', fuelFlowKgH: 3600 },
      { lat: 52, lon: 0, flightLevel: 350, time: '2026-11-20T10:40:00Z', fuelFlowKgH: 2400 },
    ];
    const { fuelBurnKg: _unused, ...noFuel } = BASE;
    void _unused;
    const r = screenFlight({ ...noFuel, route: { track: { points } } });
    const half = r.distanceKm / 2;
    const first = r.segments.filter((s) => s.endKm <= half + 1e-9).reduce((t, s) => t + s.fuelKg, 0);
    const second = r.segments.filter((s) => s.startKm >= half - 1e-9).reduce((t, s) => t + s.fuelKg, 0);
    expect(first).toBeCloseTo(550, 6);
    expect(second).toBeCloseTo(1500, 6);
    expect(r.fuelKg).toBeCloseTo(2050, 6);
    expect(r.noxTotalKg).toBeCloseTo((2050 * 14) / 1000, 6);
    expect(r.track?.fuelFromFlowKg).toBeCloseTo(2050, 6);
    expect(r.track?.enteredFuelKg).toBeNull();
    // An entered total is replaced by the points' flows, and the caution says so.
    const withTotal = screenFlight({ ...BASE, fuelBurnKg: 9999, route: { track: { points } } });
    expect(withTotal.fuelKg).toBeCloseTo(2050, 6);
    expect(withTotal.noxTotalKg).toBeCloseTo(r.noxTotalKg, 9);
    expect(withTotal.track?.enteredFuelKg).toBe(9999);
    expect(withTotal.cautions.some((c) => c.includes('the entered total') && c.includes('is not used'))).toBe(true);
  });

  it('a constant fuel flow on a steady track gives the same figures as spreading its integral by time', () => {
    const pts = greatCircleTrack('EGLL', 'KJFK', 200, 370, true);
    const flowKgH = 6000;
    const spread = screenFlight({ ...BASE, route: { track: { points: pts } } });
    const hours = spread.cruiseTimeH;
    const byFlow = screenFlight({
      ...BASE,
      route: { track: { points: pts.map((p) => ({ ...p, fuelFlowKgH: flowKgH })) } },
    });
    const sameTotal = screenFlight({ ...BASE, fuelBurnKg: flowKgH * hours, route: { track: { points: pts } } });
    expect(rel(byFlow.fuelKg, flowKgH * hours)).toBeLessThan(1e-9);
    expect(rel(byFlow.noxAboveTropopauseKg, sameTotal.noxAboveTropopauseKg)).toBeLessThan(1e-9);
    expect(rel(byFlow.ozoneLoss.centralKg, sameTotal.ozoneLoss.centralKg)).toBeLessThan(1e-9);
  });

  it('the what-if rows of a track with fuel flows carry the fuel penalty in the flows (1 % per 1000 ft here)', () => {
    const pts = greatCircleTrack('EGLL', 'KJFK', 100, 350, true).map((p) => ({ ...p, fuelFlowKgH: 6000 }));
    const base = screenFlight({ ...BASE, route: { track: { points: pts } } });
    const rows = compareCruiseLevels(
      { ...BASE, route: { track: { points: pts } } },
      { deltasFt: [0, 2000], fuelPenaltyPctPer1000Ft: 1 },
    );
    expect(rows[0].fuelKg).toBeCloseTo(base.fuelKg, 6);
    expect(rows[1].fuelKg).toBeCloseTo(base.fuelKg * 1.02, 6);
  });

  it('climb and descent: each leg flies the mean of its ends; pressure altitude in feet is the same as the flight level', () => {
    const pts = [
      { lat: 60, lon: 0, flightLevel: 100 },
      { lat: 60, lon: -5, flightLevel: 300 },
      { lat: 60, lon: -10, flightLevel: 300 },
      { lat: 60, lon: -15, flightLevel: 100 },
    ];
    const r = screenFlight({ ...BASE, route: { track: { points: pts } } });
    expect(r.levels.map((l) => l.flightLevel).sort((a, b) => a - b)).toEqual([200, 300]);
    const feet = screenFlight({
      ...BASE,
      route: {
        track: { points: pts.map(({ flightLevel, ...p }) => ({ ...p, pressureAltitudeFt: flightLevel * 100 })) },
      },
    });
    expect(feet.noxAboveTropopauseKg).toBe(r.noxAboveTropopauseKg);
    expect(feet.fuelKg).toBe(r.fuelKg);
  });

  it('cruise is optional for a track; points without a level take the cruise when one is given', () => {
    const pts = [
      { lat: 60, lon: 0 },
      { lat: 60, lon: -10 },
    ];
    const r = screenFlight({ ...BASE, cruise: { flightLevel: 390 }, route: { track: { points: pts } } });
    expect(r.levels.map((l) => l.flightLevel)).toEqual([390]);
    expect(r.cautions.some((c) => c.includes('2 points have no level'))).toBe(true);
    expect(() => screenFlight({ ...BASE, route: { track: { points: pts } } })).toThrow(ScreeningInputError);
  });

  it('the what-if rows move every point of the track', () => {
    const input = { ...BASE, route: { track: { points: greatCircleTrack('EFHK', 'PANC', 50, 350, true) } } };
    const rows = compareCruiseLevels(input, { deltasFt: [-2000, 0, 2000], fuelPenaltyPctPer1000Ft: 0 });
    expect(rows.map((r) => r.flightLevel)).toEqual([330, 350, 370]);
    expect(rows[1].noxAboveTropopauseKg).toBe(screenFlight(input).noxAboveTropopauseKg);
    // Higher above the tropopause, deeper and longer-lived: the ozone figure grows with the level.
    expect(rows[0].ozoneLoss.centralKg).toBeLessThan(rows[1].ozoneLoss.centralKg);
    expect(rows[1].ozoneLoss.centralKg).toBeLessThan(rows[2].ozoneLoss.centralKg);
  });
});

describe('track validation (field errors by path)', () => {
  const at = (points: unknown[]): string[] => {
    try {
      screenFlight({ ...BASE, cruise: { flightLevel: 350 }, route: { track: { points } } });
    } catch (e) {
      if (e instanceof ScreeningInputError) return e.fields.map((f) => f.path);
      throw e;
    }
    return [];
  };

  it.each([
    [
      'time running backwards',
      [
        { lat: 60, lon: 0, time: '2026-11-20T10:00:00Z' },
        { lat: 60, lon: -1, time: '2026-11-20T10:10:00Z' },
        { lat: 60, lon: -2, time: '2026-11-20T10:05:00Z' },
      ],
      'route.track.points.2.time',
    ],
    [
      // 1 000 km in 60 s is about 16 700 m/s, far above Mach 3 (3 x 340.294 m/s, ICAO Doc 7488/3 sea level).
      'a jump faster than Mach 3',
      [
        { lat: 60, lon: 0, time: '2026-11-20T10:00:00Z' },
        { lat: 69, lon: 0, time: '2026-11-20T10:01:00Z' },
      ],
      'route.track.points.1',
    ],
    [
      'a level above FL660',
      [
        { lat: 60, lon: 0, flightLevel: 700 },
        { lat: 60, lon: -1, flightLevel: 350 },
      ],
      'route.track.points.0.flightLevel',
    ],
    [
      'a pressure altitude below FL0',
      [
        { lat: 60, lon: 0, pressureAltitudeFt: -500 },
        { lat: 60, lon: -1 },
      ],
      'route.track.points.0.pressureAltitudeFt',
    ],
    [
      'both level forms on one point',
      [
        { lat: 60, lon: 0, flightLevel: 350, pressureAltitudeFt: 35_000 },
        { lat: 60, lon: -1 },
      ],
      'route.track.points.0.pressureAltitudeFt',
    ],
    [
      'times on some points only',
      [
        { lat: 60, lon: 0, time: '2026-11-20T10:00:00Z' },
        { lat: 60, lon: -1 },
      ],
      'route.track.points.1.time',
    ],
    [
      'a time without a zone',
      [
        { lat: 60, lon: 0, time: '2026-11-20 10:00' },
        { lat: 60, lon: -1, time: '2026-11-20T10:10:00Z' },
      ],
      'route.track.points.0.time',
    ],
    [
      'a fuel flow on some points only',
      [
        { lat: 60, lon: 0, time: '2026-11-20T10:00:00Z', fuelFlowKgH: 3000 },
        { lat: 60, lon: -1, time: '2026-11-20T10:10:00Z' },
      ],
      'route.track.points.1.fuelFlowKgH',
    ],
    [
      'a fuel flow without times',
      [
        { lat: 60, lon: 0, fuelFlowKgH: 3000 },
        { lat: 60, lon: -1, fuelFlowKgH: 3000 },
      ],
      'route.track.points.0.time',
    ],
    [
      'a negative fuel flow',
      [
        { lat: 60, lon: 0, time: '2026-11-20T10:00:00Z', fuelFlowKgH: -5 },
        { lat: 60, lon: -1, time: '2026-11-20T10:10:00Z', fuelFlowKgH: 3000 },
      ],
      'route.track.points.0.fuelFlowKgH',
    ],
    [
      'a fuel flow given as text',
      [
        { lat: 60, lon: 0, time: '2026-11-20T10:00:00Z', fuelFlowKgH: 'lots' },
        { lat: 60, lon: -1, time: '2026-11-20T10:10:00Z', fuelFlowKgH: 3000 },
      ],
      'route.track.points.0.fuelFlowKgH',
    ],
    ['one point', [{ lat: 60, lon: 0 }], 'route.track.points'],
    [
      'all points at one place',
      [
        { lat: 60, lon: 0 },
        { lat: 60, lon: 0 },
      ],
      'route.track.points',
    ],
  ])('%s', (_, points, path) => {
    expect(at(points)).toContain(path);
  });

  it('more than 20 000 points is refused', () => {
    const points = Array.from({ length: 20_001 }, (_, i) => ({ lat: 60, lon: -i * 0.001 }));
    expect(at(points)).toContain('route.track.points');
  });
});

describe('fast paths keep the same figures', () => {
  it('the written-out great-circle distance gives the same bits as geolib getDistance', () => {
    let seed = 7;
    const rnd = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    for (let i = 0; i < 2000; i++) {
      const a = [rnd() * 180 - 90, rnd() * 360 - 180];
      const b = i % 3 === 0 ? [a[0] + rnd() * 0.01, a[1] + rnd() * 0.01] : [rnd() * 180 - 90, rnd() * 360 - 180];
      const g = getDistance({ latitude: a[0], longitude: a[1] }, { latitude: b[0], longitude: b[1] }, 0.001);
      expect(geolibDistanceM(a[0], a[1], b[0], b[1])).toBe(g);
    }
  });

  it.each([
    '2026-11-20T10:15:00Z',
    '2026-11-20T10:15:00.250Z',
    '2024-02-29T23:59:59Z',
    '2026-02-29T10:00:00Z',
    '2026-13-01T10:00:00Z',
    '2026-11-20T24:00:00Z',
    '2026-11-20T10:15:00+02:00',
    '2026-11-20T10:15Z',
    'not a time',
  ])('isoTimeMs(%s) is Date.parse', (t) => {
    expect(Object.is(isoTimeMs(t), Date.parse(t))).toBe(true);
  });
});
