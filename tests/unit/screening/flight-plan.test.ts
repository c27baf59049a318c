import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Geodesic } from 'geographiclib-geodesic';
import {
  findAirport,
  formatFlightPlanCoordinate,
  parseFlightPlanRoute,
  type FlightPlanAirway,
  type FlightPlanFix,
} from '@/lib/screening';
import { legDistanceKm } from '@/lib/screening/great-circle';

// Test-only fix coordinates: invented positions for the designators the standard's examples use.
const FIXES: FlightPlanFix[] = [
  { name: 'LN', lat: 51.0, lon: -1.0 },
  { name: 'MAY', lat: 51.5, lon: -3.0 },
  { name: 'HADDY', lat: 52.0, lon: -5.0 },
  { name: 'DUB', lat: 53.0, lon: -6.0 },
  { name: 'LEK', lat: 60.0, lon: 5.0 },
  { name: 'XMM', lat: 58.0, lon: 0.0 },
  { name: 'PON', lat: 56.0, lon: -3.0 },
  { name: 'CHW', lat: 54.0, lon: -4.0 },
  { name: 'NTS', lat: 48.0, lon: -2.0 },
  { name: 'STG', lat: 44.0, lon: -8.0 },
  { name: 'FTM', lat: 40.0, lon: -9.0 },
  { name: 'BCN', lat: 52.0, lon: -10.0 },
];

const near = (a: number, b: number, tol = 1e-9) => Math.abs(a - b) <= tol;

describe('speed and level groups (Doc 4444 Appendix 2, item 15 (a) and (b))', () => {
  it.each([
    // [group, mach, tasKt, flightLevel] - the standard's speed examples K0830, N0485, M082 and level
    // examples F085, F330, S1130, A045, A100, M0840 (Doc 4444 Appendix 2, item 15, from memory).
    ['N0485F085', undefined, 485, 85],
    ['M082F330', 0.82, undefined, 330],
    ['K0830S1130', undefined, 830 / 1.852, Math.round(11300 / 30.48)],
    ['N0485A045', undefined, 485, 45],
    ['N0485A100', undefined, 485, 100],
    ['M082M0840', 0.82, undefined, Math.round(8400 / 30.48)],
    ['N0480F350', undefined, 480, 350],
    ['M084F390', 0.84, undefined, 390],
  ])('%s', (group, mach, tasKt, fl) => {
    const r = parseFlightPlanRoute(`${group} 50N020W 50N030W`);
    expect(r.unresolved).toEqual([]);
    expect(r.cruise.steps).toEqual([{ fromKm: 0, flightLevel: fl }]);
    expect(r.speeds[0].fromKm).toBe(0);
    if (mach !== undefined) expect(r.speeds[0].mach).toBeCloseTo(mach, 12);
    if (tasKt !== undefined) expect(r.speeds[0].tasKt).toBeCloseTo(tasKt, 9);
  });

  it('K0830S1190: a metric level is flown at the nearest flight level with a note (1 ft = 0.3048 m, ICAO Annex 5)', () => {
    const r = parseFlightPlanRoute('K0830S1190 50N020W 50N030W');
    expect(r.cruise.steps[0].flightLevel).toBe(390); // 11 900 m / 30.48 m = 390.4
    expect(r.notes.join(' ')).toMatch(/S1190.*11900 m.*FL390/);
  });

  it('VFR as the level is noted and gives no step; an IFR change later is noted (Doc 4444 example "LN VFR", "LN/N0284A050 IFR")', () => {
    const r = parseFlightPlanRoute('N0284VFR LN VFR LN/N0284A050 IFR', { fixes: FIXES });
    expect(r.unresolved).toEqual([]);
    expect(r.cruise.steps).toEqual([{ fromKm: 0, flightLevel: 50 }]);
    expect(r.notes.some((n) => n.startsWith('VFR:'))).toBe(true);
    expect(r.notes.some((n) => n.startsWith('IFR at offset'))).toBe(true);
  });

  it('a level beyond FL660 is unresolved, with its offset', () => {
    const r = parseFlightPlanRoute('N0480F700 50N020W 50N030W');
    expect(r.unresolved).toEqual([{ item: 'N0480F700', position: 0, reason: expect.stringContaining('FL700') }]);
    expect(r.cruise.steps).toEqual([]);
  });
});

describe('significant points (Doc 4444 Appendix 2, item 15 (c) 2)', () => {
  it('coded designators LN, MAY, HADDY are looked up in the fix library', () => {
    const r = parseFlightPlanRoute('N0480F350 LN MAY HADDY', { fixes: FIXES });
    expect(r.unresolved).toEqual([]);
    expect(r.waypoints).toEqual([
      { lat: 51, lon: -1, name: 'LN' },
      { lat: 51.5, lon: -3, name: 'MAY' },
      { lat: 52, lon: -5, name: 'HADDY' },
    ]);
    expect(r.items.filter((i) => i.kind === 'point').map((i) => i.status)).toEqual([
      'looked-up',
      'looked-up',
      'looked-up',
    ]);
  });

  it.each([
    // Degrees only (Doc 4444: "46N078W") and degrees and minutes ("4620N05805W"), plus the forms at the poles and the antimeridian.
    ['46N078W', 46, -78],
    ['4620N05805W', 46 + 20 / 60, -(58 + 5 / 60)],
    ['4620N07805W', 46 + 20 / 60, -(78 + 5 / 60)],
    ['90N000E', 90, 0],
    ['90S000W', -90, -0],
    ['00N180E', 0, 180],
    ['00S180W', -0, -180],
    ['5230S17945E', -52.5, 179.75],
    ['462034N0780512W', 46 + 20 / 60 + 34 / 3600, -(78 + 5 / 60 + 12 / 3600)],
  ])('%s', (text, lat, lon) => {
    const r = parseFlightPlanRoute(`N0480F350 ${text} 10N010E`);
    expect(r.unresolved).toEqual([]);
    expect(near(r.waypoints[0].lat, lat)).toBe(true);
    expect(near(r.waypoints[0].lon, lon)).toBe(true);
    expect(r.waypoints[0].name).toBe(text);
    expect(r.items[1]).toMatchObject({ kind: 'coordinates', status: 'read', position: 10 });
  });

  it.each([
    ['91N000E', /beyond 90/],
    ['46N181W', /beyond 180/],
    ['4660N07805W', /60 or more/],
  ])('%s is unresolved with its reason', (text, reason) => {
    const r = parseFlightPlanRoute(`N0480F350 10N010E ${text} 12N012E`);
    expect(r.unresolved).toHaveLength(1);
    expect(r.unresolved[0]).toMatchObject({ item: text, position: 18 });
    expect(r.unresolved[0].reason).toMatch(reason);
    expect(r.waypoints).toHaveLength(2);
  });

  it('a route across the antimeridian takes the short way (great-circle distance, not round the world)', () => {
    const r = parseFlightPlanRoute('M085F370 50N170E 52N180E 52N180W 50N170W');
    const total = r.waypoints
      .slice(1)
      .reduce((s, w, i) => s + legDistanceKm(r.waypoints[i].lat, r.waypoints[i].lon, w.lat, w.lon), 0);
    // 50N170E-50N170W is 20 degrees of longitude at about 51N: roughly 1 400 km (common practice: 111 km per degree x cos lat).
    expect(total).toBeGreaterThan(1300);
    expect(total).toBeLessThan(1600);
  });

  it('a route over the North Pole: the pole is one point whatever its longitude', () => {
    const r = parseFlightPlanRoute('M085F370 80N000E 90N000E 80N180E');
    expect(r.unresolved).toEqual([]);
    // Two 10-degree meridian arcs on the mean sphere (R = 6371.0088 km, IUGG): 2 x 1111.95 km.
    const a = legDistanceKm(r.waypoints[0].lat, r.waypoints[0].lon, r.waypoints[1].lat, r.waypoints[1].lon);
    const b = legDistanceKm(r.waypoints[1].lat, r.waypoints[1].lon, r.waypoints[2].lat, r.waypoints[2].lon);
    expect(a + b).toBeCloseTo(2 * 1111.95, 0);
  });

  it('DUB180040: 40 NM on bearing 180 from DUB (Doc 4444 example), against the WGS-84 geodesic (GeographicLib) within 0.5 %', () => {
    const r = parseFlightPlanRoute('N0480F350 DUB180040 50N010W', { fixes: FIXES });
    expect(r.unresolved).toEqual([]);
    const p = r.waypoints[0];
    const ref = Geodesic.WGS84.Direct(53, -6, 180, 40 * 1852);
    expect(Math.abs(p.lat - ref.lat2!)).toBeLessThan(0.005 * (53 - ref.lat2!));
    expect(p.lon).toBeCloseTo(-6, 9);
    expect(r.items[1]).toMatchObject({ kind: 'bearing-distance', status: 'looked-up' });
    expect(r.notes.some((n) => n.includes('magnetic'))).toBe(true);
  });

  it('a bearing from an unknown point is unresolved with its offset', () => {
    const r = parseFlightPlanRoute('N0480F350 50N010W QQQ090100 50N020W');
    expect(r.unresolved).toEqual([
      { item: 'QQQ090100', position: 18, reason: expect.stringContaining('QQQ is not in the fix library') },
    ]);
  });

  it('same-named points: the one nearest along the route is chosen, named with its region in a note', () => {
    const fixes: FlightPlanFix[] = [
      { name: 'QXOVK', lat: 60, lon: -20, region: 'north' },
      { name: 'QXOVK', lat: -30, lon: 100, region: 'south' },
    ];
    const r = parseFlightPlanRoute('N0480F350 58N015W QXOVK 62N030W', { fixes });
    expect(r.waypoints[1]).toEqual({ lat: 60, lon: -20, name: 'QXOVK' });
    expect(r.notes.find((n) => n.startsWith('QXOVK:'))).toMatch(/2 points.*\(north\)/);
  });

  it('an unknown name is unresolved: "not in the fix library"', () => {
    const r = parseFlightPlanRoute('N0480F350 LN QWERT MAY', { fixes: FIXES });
    expect(r.unresolved).toEqual([{ item: 'QWERT', position: 13, reason: 'QWERT is not in the fix library.' }]);
    expect(r.waypoints.map((w) => w.name)).toEqual(['LN', 'MAY']);
    expect(r.items.find((i) => i.item === 'QWERT')?.status).toBe('not-found');
  });
});

describe('changes of speed and level (Doc 4444 Appendix 2, item 15 (c) 6)', () => {
  it.each([
    // The standard's examples of a change at a point.
    ['LN/N0284A045', 45, { tasKt: 284 }],
    ['MAY/N0305F180', 180, { tasKt: 305 }],
    ['HADDY/N0420F330', 330, { tasKt: 420 }],
    ['4602N07805W/N0500F350', 350, { tasKt: 500 }],
    ['46N078W/M082F330', 330, { mach: 0.82 }],
    ['DUB180040/N0350M0840', Math.round(8400 / 30.48), { tasKt: 350 }],
  ])('%s becomes a step at the cumulative distance of its point', (item, fl, speed) => {
    const r = parseFlightPlanRoute(`N0450F100 10N010W DCT 20N010W DCT ${item}`, { fixes: FIXES });
    expect(r.unresolved).toEqual([]);
    const w = r.waypoints;
    const km =
      legDistanceKm(w[0].lat, w[0].lon, w[1].lat, w[1].lon) + legDistanceKm(w[1].lat, w[1].lon, w[2].lat, w[2].lon);
    expect(r.cruise.steps).toEqual([
      { fromKm: 0, flightLevel: 100 },
      { fromKm: km, flightLevel: fl },
    ]);
    expect(r.speeds[1]).toEqual({ fromKm: km, ...speed });
  });

  it('steps are measured from the departure aerodrome when one is given, and the destination closes the route', () => {
    const r = parseFlightPlanRoute('N0480F350 DCT 5530N02000W 56N030W/N0480F370 DCT', { from: 'EGLL', to: 'KJFK' });
    const [egll, a, b, kjfk] = r.waypoints;
    expect(egll.name).toBe('EGLL');
    expect(kjfk.name).toBe('KJFK');
    expect(egll.lat).toBeCloseTo(findAirport('EGLL')!.lat, 9);
    const km = legDistanceKm(egll.lat, egll.lon, a.lat, a.lon) + legDistanceKm(a.lat, a.lon, b.lat, b.lon);
    expect(r.cruise.steps[1]).toEqual({ fromKm: km, flightLevel: 370 });
    expect(r.notes.filter((n) => n.startsWith('DCT at the'))).toHaveLength(2);
  });

  it('IATA codes for from/to resolve through the airport lookup; an unknown code is unresolved with position null', () => {
    const r = parseFlightPlanRoute('N0480F350 55N020W', { from: 'LHR', to: 'QQQ' });
    expect(r.waypoints[0].name).toBe('EGLL');
    expect(r.unresolved).toEqual([
      { item: 'QQQ', position: null, reason: expect.stringContaining('destination aerodrome QQQ') },
    ]);
  });

  it('cruise climb C/48N050W/M082F290F350 (Doc 4444 example): step at the first level, noted', () => {
    const r = parseFlightPlanRoute('M082F270 45N040W C/48N050W/M082F290F350 49N060W');
    expect(r.unresolved).toEqual([]);
    expect(r.cruise.steps.map((s) => s.flightLevel)).toEqual([270, 290]);
    expect(r.notes.some((n) => n.includes('cruise climb') && n.includes('FL350'))).toBe(true);
  });
});

describe('airways, SID and STAR (Doc 4444 Appendix 2, item 15 (c) 1, 3, 4)', () => {
  const EXAMPLE =
    'N0460F290 LEK2B LEK UA6 XMM/M078F330 UA6N PON UR10N CHW UA5 NTS DCT 4611N00412W DCT STG UA5 FTM FATIM1A';

  it("the standard's worked example: SID and STAR ignored with a note, airways flown as great circles with a note, change at XMM", () => {
    const r = parseFlightPlanRoute(EXAMPLE, { fixes: FIXES });
    expect(r.unresolved).toEqual([]);
    expect(r.waypoints.map((w) => w.name)).toEqual(['LEK', 'XMM', 'PON', 'CHW', 'NTS', '4611N00412W', 'STG', 'FTM']);
    expect(r.notes.some((n) => n.startsWith('LEK2B: SID ignored'))).toBe(true);
    expect(r.notes.some((n) => n.startsWith('FATIM1A: STAR ignored'))).toBe(true);
    expect(r.notes.filter((n) => /not in the airway library; flown as a great circle/.test(n))).toHaveLength(5);
    const km = legDistanceKm(60, 5, 58, 0);
    expect(r.cruise.steps).toEqual([
      { fromKm: 0, flightLevel: 290 },
      { fromKm: km, flightLevel: 330 },
    ]);
    expect(r.speeds).toEqual([
      { fromKm: 0, tasKt: 460 },
      { fromKm: km, mach: 0.78 },
    ]);
  });

  it('an airway in the library is expanded through its points, in either direction', () => {
    const fixes: FlightPlanFix[] = [
      ...FIXES,
      { name: 'QXKAV', lat: 59, lon: 3 },
      { name: 'QXMEL', lat: 58.5, lon: 1.5 },
    ];
    const airways: FlightPlanAirway[] = [{ name: 'UA6', fixes: ['LEK', 'QXKAV', 'QXMEL', 'XMM'] }];
    const fwd = parseFlightPlanRoute('N0460F290 LEK UA6 XMM', { fixes, airways });
    expect(fwd.waypoints.map((w) => w.name)).toEqual(['LEK', 'QXKAV', 'QXMEL', 'XMM']);
    expect(fwd.items.find((i) => i.item === 'UA6')?.status).toBe('looked-up');
    const back = parseFlightPlanRoute('N0460F290 XMM UA6 LEK', { fixes, airways });
    expect(back.waypoints.map((w) => w.name)).toEqual(['XMM', 'QXMEL', 'QXKAV', 'LEK']);
    const off = parseFlightPlanRoute('N0460F290 LEK UA6 PON', { fixes, airways });
    expect(off.waypoints.map((w) => w.name)).toEqual(['LEK', 'PON']);
    expect(off.notes.some((n) => n.includes('PON is not on this airway') && n.includes('great circle'))).toBe(true);
  });

  it('fixes may also be the whole library { fixes, airways }, as the public contract gives it', () => {
    const fixes: FlightPlanFix[] = [
      ...FIXES,
      { name: 'QXKAV', lat: 59, lon: 3 },
      { name: 'QXMEL', lat: 58.5, lon: 1.5 },
    ];
    const airways: FlightPlanAirway[] = [{ name: 'UA6', fixes: ['LEK', 'QXKAV', 'QXMEL', 'XMM'] }];
    const r = parseFlightPlanRoute('N0460F290 LEK UA6 XMM', { fixes: { fixes, airways } });
    expect(r.waypoints.map((w) => w.name)).toEqual(['LEK', 'QXKAV', 'QXMEL', 'XMM']);
    expect(r.unresolved).toEqual([]);
  });

  it('M082F310 BCN1G BCN UG1 52N015W 52N020W 52N030W 50N040W 49N050W (Doc 4444 example): airway to coordinates flown as a great circle', () => {
    const r = parseFlightPlanRoute('M082F310 BCN1G BCN UG1 52N015W 52N020W 52N030W 50N040W 49N050W', { fixes: FIXES });
    expect(r.unresolved).toEqual([]);
    expect(r.waypoints).toHaveLength(6);
    expect(r.notes.some((n) => n.startsWith('UG1:'))).toBe(true);
  });

  it('an airway with no exit point, and items that are not item-15, are unresolved with their offsets', () => {
    const r = parseFlightPlanRoute('N0480F350 LN UA1 DCT MAY %%% UB2', { fixes: FIXES });
    expect(r.unresolved.map((u) => [u.item, u.position])).toEqual([
      ['UA1', 13],
      ['%%%', 25],
      ['UB2', 29],
    ]);
  });

  it('text without a speed/level group says so and still reads the points', () => {
    const r = parseFlightPlanRoute('50N020W 50N030W');
    expect(r.unresolved[0]).toMatchObject({ item: '50N020W', position: 0 });
    expect(r.waypoints).toHaveLength(2);
    expect(r.cruise.steps).toEqual([]);
  });
});

describe('round trip and robustness', () => {
  it('waypoints at whole minutes survive formatting to item-15 coordinates and parsing back (property)', () => {
    const minute = (max: number) => fc.integer({ min: -max * 60, max: max * 60 }).map((m) => m / 60);
    fc.assert(
      fc.property(
        fc.array(fc.record({ lat: minute(90), lon: minute(180) }), { minLength: 2, maxLength: 30 }),
        (pts) => {
          const text = `M085F370 ${pts.map((p) => formatFlightPlanCoordinate(p.lat, p.lon)).join(' DCT ')}`;
          const r = parseFlightPlanRoute(text);
          expect(r.unresolved).toEqual([]);
          expect(r.waypoints).toHaveLength(pts.length);
          r.waypoints.forEach((w, i) => {
            expect(Math.abs(w.lat - pts[i].lat)).toBeLessThan(1e-9);
            // -180 and 180 are the same meridian.
            expect(Math.abs(Math.abs(w.lon - pts[i].lon) % 360)).toBeLessThan(1e-9);
          });
        },
      ),
      { numRuns: 300 },
    );
  });

  it('whole degrees use the short form, others degrees and minutes', () => {
    expect(formatFlightPlanCoordinate(46, -78)).toBe('46N078W');
    expect(formatFlightPlanCoordinate(46 + 20 / 60, -(78 + 5 / 60))).toBe('4620N07805W');
    expect(formatFlightPlanCoordinate(-90, 180)).toBe('90S180E');
  });

  it('never throws, and every non-blank item is placed, ignored or listed as unresolved (property)', () => {
    const word = fc.constantFrom(
      'DCT',
      'LN',
      'UA6',
      '46N078W',
      'N0480F350',
      'X/Y',
      'C/',
      'MAY/M082F330',
      'FATIM1A',
      'VFR',
      '9',
      'DUB180040',
      '??',
    );
    fc.assert(
      fc.property(fc.array(word, { maxLength: 20 }), (words) => {
        const text = words.join(' ');
        const r = parseFlightPlanRoute(text, { fixes: FIXES });
        const accounted = new Set([...r.items.map((i) => i.position), ...r.unresolved.map((u) => u.position)]);
        let pos = 0;
        for (const w of words) {
          expect(accounted.has(pos)).toBe(true);
          pos += w.length + 1;
        }
      }),
      { numRuns: 300 },
    );
  });
});

describe('screening a flight-plan route (screenFlight with route.flightPlan)', () => {
  const BASE = { cruise: { flightLevel: 330 }, fuelBurnKg: 40_000, emission: { eiNoxGPerKg: 14 }, month: 1 };

  it('gives the same figures as the same waypoints and steps entered by hand', async () => {
    const { screenFlight } = await import('@/lib/screening');
    const text = 'M084F350 DCT 60N020W 63N030W/M084F370 65N040W DCT';
    const fp = screenFlight({ ...BASE, route: { flightPlan: { text, from: 'EGLL', to: 'CYYZ' } } });
    const parsed = parseFlightPlanRoute(text, { from: 'EGLL', to: 'CYYZ' });
    const byHand = screenFlight({
      ...BASE,
      route: { waypoints: parsed.waypoints.map((w) => ({ lat: w.lat, lon: w.lon })) },
      cruise: { steps: parsed.cruise.steps },
    });
    expect(fp.noxAboveTropopauseKg).toBe(byHand.noxAboveTropopauseKg);
    expect(fp.distanceKm).toBe(byHand.distanceKm);
    expect(fp.flightPlan?.cruise.steps.map((s) => s.flightLevel)).toEqual([350, 370]);
    expect(fp.flightPlan?.levelsFromText).toBe(true);
    expect(fp.cautions.some((c) => c.includes('levels are those of the flight plan'))).toBe(true);
  });

  it('keeps the entered cruise when the text has no level, and lists unplaced items in the cautions', async () => {
    const { screenFlight } = await import('@/lib/screening');
    const r = screenFlight({
      ...BASE,
      route: { flightPlan: { text: 'DCT 60N020W QQQQQ 63N030W DCT', from: 'EGLL', to: 'CYYZ' } },
    });
    expect(r.levels.map((l) => l.flightLevel)).toEqual([330]);
    expect(r.flightPlan?.unresolved.map((u) => u.item)).toEqual(['DCT', 'QQQQQ']);
    expect(r.cautions.some((c) => c.includes('QQQQQ at character 13'))).toBe(true);
  });

  it.each([
    [{ text: '', from: 'EGLL', to: 'CYYZ' }, 'route.flightPlan.text'],
    [{ text: 'N0480F350 DCT', from: 'QQQQ', to: 'CYYZ' }, 'route.flightPlan.from'],
    [{ text: 'N0480F350 DCT', from: 'EGLL', to: 'ZZZZ' }, 'route.flightPlan.to'],
    [{ text: 'N0480F350 DCT', from: 'EGLL' }, 'route.flightPlan.to'],
    [{ text: 'N0480F350 DCT', from: 'EGLL', to: 'CYYZ', extra: 1 }, 'route.flightPlan'],
  ])('field errors by path: %o -> %s', async (flightPlan, path) => {
    const { screenFlight, ScreeningInputError } = await import('@/lib/screening');
    let err: unknown;
    try {
      screenFlight({ ...BASE, route: { flightPlan } });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ScreeningInputError);
    expect((err as InstanceType<typeof ScreeningInputError>).fields.map((f) => f.path)).toContain(path);
  });

  it('the what-if rows shift the levels read from the text', async () => {
    const { compareCruiseLevels } = await import('@/lib/screening');
    const rows = compareCruiseLevels(
      {
        ...BASE,
        route: { flightPlan: { text: 'M084F350 DCT 60N020W 63N030W/M084F370 DCT', from: 'EGLL', to: 'CYYZ' } },
      },
      { deltasFt: [-2000, 0] },
    );
    expect(rows.map((r) => r.flightLevels)).toEqual([
      [330, 350],
      [350, 370],
    ]);
  });
});

describe('inputAsScreened', () => {
  it('re-works a saved flight-plan screening on the route read then, whatever the library holds now', async () => {
    const { screenValidated, validateScreeningInput, compareCruiseLevels, inputAsScreened } =
      await import('@/lib/screening');
    const input = validateScreeningInput({
      route: { flightPlan: { text: 'N0460F350 LN MAY/N0460F370 HADDY', from: 'EGLL', to: 'EIDW' } },
      cruise: { flightLevel: 300 },
      fuelBurnKg: 3000,
      emission: { eiNoxGPerKg: 14 },
      month: 7,
    });
    const saved = screenValidated(input, { fixes: FIXES });
    const again = inputAsScreened(input, saved.flightPlan);
    expect('waypoints' in again.route && again.route.waypoints).toHaveLength(5);
    const rows = compareCruiseLevels(again, { deltasFt: [0] });
    expect(rows[0].noxAboveTropopauseKg).toBe(saved.noxAboveTropopauseKg);
    expect(rows[0].flightLevels).toEqual([350, 370]);
  });
});

describe('aerodromes written into the route text', () => {
  it('the departure and destination repeated at the ends are ignored with a note, by ICAO or IATA code (common practice when pasting)', () => {
    const r = parseFlightPlanRoute('N0480F350 LHR DCT 55N020W DCT KJFK', { from: 'LHR', to: 'KJFK' });
    expect(r.unresolved).toEqual([]);
    expect(r.waypoints.map((w) => w.name)).toEqual(['EGLL', '55N020W', 'KJFK']);
    expect(r.items.filter((i) => i.status === 'ignored').map((i) => i.item)).toEqual(['LHR', 'KJFK']);
  });
});
