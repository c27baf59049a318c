import { describe, expect, it } from 'vitest';
import {
  buildScreeningBody,
  emptyScreenForm,
  formPathFor,
  parseWaypointList,
  readNumber,
  screenFormProblems,
  type ScreenFormContext,
  type ScreenFormValues,
} from '@/components/screening/screen-form-adapter';
import { screeningInputSchema } from '@/lib/validation/screening';
import { DAYLIGHT_FACTOR_EQUINOX, DEFAULT_OZONE_INPUTS } from '@/lib/screening';

const defaults: ScreenFormContext['defaults'] = {
  jO3NoonPerS: { ...DEFAULT_OZONE_INPUTS.jO3NoonPerS },
  jNo2NoonPerS: { ...DEFAULT_OZONE_INPUTS.jNo2NoonPerS },
  daylightFactor: { ...DAYLIGHT_FACTOR_EQUINOX },
  noxToNoyFraction: { ...DEFAULT_OZONE_INPUTS.noxToNoyFraction },
  ohCm3: DEFAULT_OZONE_INPUTS.ohCm3,
  ho2Cm3: DEFAULT_OZONE_INPUTS.ho2Cm3,
  relativeHumidity: DEFAULT_OZONE_INPUTS.relativeHumidity,
  residenceTime: { ...DEFAULT_OZONE_INPUTS.residenceTime },
};

const engine = {
  fuelFlowKgS: [0.1, 0.3, 0.9, 1.1] as [number, number, number, number],
  eiNoxGPerKg: [5, 11, 23, 30] as [number, number, number, number],
};

function ctx(units: 'metric' | 'imperial' = 'metric'): ScreenFormContext {
  return {
    units,
    defaults,
    aircraft: [
      { code: 'T-ENG', emission: { engine, engineCount: 2, mach: 0.84 }, typicalMach: 0.84 },
      { code: 'T-EI', emission: { eiNoxGPerKg: 11.5 }, typicalMach: 1.7 },
      { code: 'T-NONE', emission: null, typicalMach: 0.8 },
    ],
    engines: [{ id: 7, ...engine }],
    soundings: [
      {
        id: 3,
        levels: [
          { pressureHpa: 300, temperatureK: 229 },
          { pressureHpa: 250, temperatureK: 221 },
          { pressureHpa: 200, temperatureK: 216 },
        ],
      },
    ],
  };
}

function filled(patch: Partial<ScreenFormValues> = {}): ScreenFormValues {
  return {
    ...emptyScreenForm('2026-11-20'),
    airports: [{ code: 'egll' }, { code: 'RJAA' }],
    fuelBurn: '60000',
    aircraft: 'T-ENG',
    ...patch,
  };
}

describe('readNumber', () => {
  it.each([
    ['60000', 60000],
    ['60 000', 60000],
    ['60,000', 60000],
    ['1,234,567.5', 1234567.5],
    ['0,85', 0.85],
    ['4.5e-4', 4.5e-4],
    ['-0.45', -0.45],
    ['.5', 0.5],
    ['', null],
    ['12a', null],
    ['1.2.3', null],
    ['6,00', 6],
  ])('%j -> %j', (text, expected) => {
    expect(readNumber(text)).toBe(expected);
  });
});

describe('parseWaypointList', () => {
  it('reads each accepted way of writing a point, latitude first', () => {
    const r = parseWaypointList(
      [
        '51.47 -0.45',
        '64.13,-21.94',
        '61.17N 150.00W',
        'S33.95 E151.18',
        '# a comment',
        '',
        '35.76\t140.39',
        '1.5; 2.5',
        '51,47 -0,45',
      ].join('\n'),
    );
    expect(r.problems).toEqual([]);
    expect(r.points).toEqual([
      { lat: 51.47, lon: -0.45 },
      { lat: 64.13, lon: -21.94 },
      { lat: 61.17, lon: -150 },
      { lat: -33.95, lon: 151.18 },
      { lat: 35.76, lon: 140.39 },
      { lat: 1.5, lon: 2.5 },
      { lat: 51.47, lon: -0.45 },
    ]);
  });

  it.each([
    ['51.47', 'Line 1: give a latitude and a longitude'],
    ['north -0.45', 'is not a latitude and a longitude'],
    ['6072N01105E', 'minutes and seconds must be below 60'],
    ['60 12 75N 011 05E', 'minutes and seconds must be below 60'],
    ['95 10', 'latitude 95 is outside -90 to 90'],
    ['10 190', 'longitude 190 is outside -180 to 180'],
    ['0.45W 51.47N', 'put the latitude first'],
    ['51.47E 0.45N', 'put the latitude first'],
    ['', 'Paste at least two points'],
  ])('%j is refused: %s', (text, message) => {
    const r = parseWaypointList(text);
    expect(r.points).toEqual([]);
    expect(r.problems.map((p) => p.message).join(' ')).toContain(message);
  });

  // Compact form as in ICAO Doc 4444 (flight plan item 15: 2 or 4/6 digits of latitude, 3 or 5/7 of longitude).
  it.each([
    ['6012N01105E', 60.2, 11 + 5 / 60],
    ['6012S01105W', -60.2, -(11 + 5 / 60)],
    ['601230N0110545E', 60 + 12 / 60 + 30 / 3600, 11 + 5 / 60 + 45 / 3600],
    ['60 12.5N 011 05.3E', 60 + 12.5 / 60, 11 + 5.3 / 60],
    ['N60 12.5 E011 05.3', 60 + 12.5 / 60, 11 + 5.3 / 60],
    ["60°12'N 11°05'E", 60.2, 11 + 5 / 60],
    ['60°12\'30"N 11°05\'45"W', 60 + 12 / 60 + 30 / 3600, -(11 + 5 / 60 + 45 / 3600)],
    ["N 60°12.5' W 011°05.3'", 60 + 12.5 / 60, -(11 + 5.3 / 60)],
    ['-33°52\'04", 151°12\'36"', -(33 + 52 / 60 + 4 / 3600), 151 + 12 / 60 + 36 / 3600],
    ['60 12 30N 011 05 45E', 60 + 12 / 60 + 30 / 3600, 11 + 5 / 60 + 45 / 3600],
  ])('reads the sexagesimal form %j', (text, lat, lon) => {
    const r = parseWaypointList(text);
    expect(r.problems).toEqual([]);
    expect(r.points).toHaveLength(1);
    expect(r.points[0].lat).toBeCloseTo(lat, 9);
    expect(r.points[0].lon).toBeCloseTo(lon, 9);
  });

  it('reports the line number of each bad line and keeps the good ones', () => {
    const r = parseWaypointList('51.47 -0.45\nabc\n64.13 -21.94\n100 0');
    expect(r.points).toHaveLength(2);
    expect(r.problems.map((p) => p.line)).toEqual([2, 4]);
  });
});

describe('step climbs at a waypoint', () => {
  it('a step placed at a stop goes to the server as atWaypoint, and the form finds nothing wrong with it', () => {
    const v = filled({
      airports: [{ code: 'EGLL' }, { code: 'BIKF' }, { code: 'PANC' }],
      cruiseMode: 'steps',
      steps: [
        { from: '0', flightLevel: '350' },
        { from: '', flightLevel: '370', at: '1' },
        { from: '', flightLevel: '390', at: '' },
      ],
    });
    const { body, problems } = screenFormProblems(v, ctx());
    // Only the blank distance is named: no whole-cruise message that would outlive its fix.
    expect(problems.map((p) => p.path)).toEqual(['steps.2.from']);
    expect(body.cruise).toEqual({
      steps: [
        { fromKm: 0, flightLevel: 350 },
        { atWaypoint: 1, flightLevel: 370 },
        { fromKm: Number.NaN, flightLevel: 390 },
      ],
    });
    const fixed = screenFormProblems(
      { ...v, steps: [v.steps[0], v.steps[1], { from: '6000', flightLevel: '390' }] },
      ctx(),
    );
    expect(fixed.problems).toEqual([]);
  });
});

describe('buildScreeningBody', () => {
  it('a complete metric form becomes a valid engine input with the aircraft emission and method', () => {
    const { body, problems } = buildScreeningBody(filled({ method: 'dlr' }), ctx());
    expect(problems).toEqual([]);
    expect(body.route).toEqual({ waypoints: [{ airport: 'EGLL' }, { airport: 'RJAA' }] });
    expect(body.aircraft).toBe('T-ENG');
    expect(body.emission).toEqual({ engine, engineCount: 2, mach: 0.84, method: 'dlr' });
    expect(body.flightDate).toBe('2026-11-20');
    const { aircraft: _a, ...engineInput } = body;
    expect(screeningInputSchema.safeParse(engineInput).success).toBe(true);
  });

  it('imperial entries are converted: lb, NM and ft', () => {
    const v = filled({
      fuelBurn: '100000',
      cruiseMode: 'steps',
      steps: [
        { from: '0', flightLevel: '350' },
        { from: '1000', flightLevel: '390' },
      ],
      tropopauseMode: 'altitude',
      tropopauseAltitude: '36000',
    });
    const { body, problems } = buildScreeningBody(v, ctx('imperial'));
    expect(problems).toEqual([]);
    // 1 lb = 0.45359237 kg, 1 NM = 1852 m, 1 ft = 0.3048 m, all exact (NIST SP 811, appendix B).
    expect(body.fuelBurnKg).toBeCloseTo(45_359.237, 6);
    expect(body.cruise).toEqual({
      steps: [
        { fromKm: 0, flightLevel: 350 },
        { fromKm: 1852, flightLevel: 390 },
      ],
    });
    expect(body.tropopause).toEqual({ altitudeM: expect.closeTo(10_972.8, 6) as unknown as number });
  });

  it('a direct EI, an engine with a count, a month and a sounding', () => {
    const direct = buildScreeningBody(
      filled({ emissionMode: 'direct', eiNox: '14.5', month: '1', tropopauseMode: 'sounding', soundingId: '3' }),
      ctx(),
    ).body;
    expect(direct.emission).toEqual({ eiNoxGPerKg: 14.5 });
    expect(direct.aircraft).toBeUndefined();
    expect(direct.month).toBe(1);
    expect(direct.tropopause).toEqual({ sounding: ctx().soundings[0].levels });
    const withEngine = buildScreeningBody(
      filled({ emissionMode: 'engine', engineId: '7', engineCount: '4', mach: '0.86' }),
      ctx(),
    ).body;
    expect(withEngine.emission).toEqual({ engine, engineCount: 4, method: 'bffm2', mach: 0.86 });
    expect(withEngine.mach).toBe(0.86);
  });

  it('assumption bands: a blank part keeps its default, relative humidity is entered in per cent', () => {
    const v = filled();
    v.assumptions.jO3NoonPerS = { low: '', central: '5e-4', high: '' };
    v.assumptions.relativeHumidity = '45';
    v.assumptions.ozoneProfile = 'subarctic-winter';
    const { body, problems } = buildScreeningBody(v, ctx());
    expect(problems).toEqual([]);
    expect(body.assumptions).toEqual({
      jO3NoonPerS: { low: defaults.jO3NoonPerS.low, central: 5e-4, high: defaults.jO3NoonPerS.high },
      relativeHumidity: 0.45,
      ozoneProfile: 'subarctic-winter',
    });
  });
});

describe('screenFormProblems', () => {
  const messages = (v: ScreenFormValues, c = ctx()) =>
    Object.fromEntries(screenFormProblems(v, c).problems.map((p) => [p.path, p.message]));

  it('names each missing field in a planner’s words', () => {
    const m = messages({ ...emptyScreenForm(), aircraft: '' });
    expect(m['airports.0.code']).toBe('Enter the departure airport.');
    expect(m['airports.1.code']).toBe('Enter the destination airport.');
    expect(m.fuelBurn).toBe('Enter the cruise fuel burn in kg.');
    expect(m.aircraft).toBe('Choose an aircraft type, or give the EI NOx directly.');
  });

  it('engine checks come back beside the right field, once each', () => {
    const m = messages(
      filled({
        airports: [{ code: 'EGLL' }, { code: 'X1' }],
        cruiseMode: 'steps',
        steps: [
          { from: '0', flightLevel: '350' },
          { from: '3000', flightLevel: '700' },
          { from: '2000', flightLevel: '390' },
        ],
        emissionMode: 'direct',
        eiNox: '250',
        tropopauseMode: 'pressure',
        tropopausePressure: '900',
      }),
    );
    expect(m['airports.1.code']).toMatch(/3 letters .* or 4 characters/);
    expect(m['steps.1.flightLevel']).toBe('The flight level must be between 0 and 660.');
    expect(m['steps.2.from']).toBe('Each cruise step must start further along the route than the one before.');
    expect(m.eiNox).toBe('The EI NOx must be between 0 and 200 g/kg.');
    expect(m.tropopausePressure).toBe('The tropopause pressure must be between 25 and 700 hPa.');
  });

  it('ranges of fields typed in the user’s units are stated in those units', () => {
    expect(messages(filled({ fuelBurn: '2000000' }), ctx('imperial')).fuelBurn).toBe(
      'The fuel burn must be between 2.3 and 1 102 311 lb.',
    );
    expect(messages(filled({ fuelBurn: '0.5' })).fuelBurn).toBe('The fuel burn must be between 1 and 500 000 kg.');
    expect(
      messages(filled({ tropopauseMode: 'altitude', tropopauseAltitude: '2000' }), ctx('imperial')).tropopauseAltitude,
    ).toBe('The tropopause altitude must be between 9 843 and 82 020 ft.');
  });

  it('an inverted assumption band is reported on its row', () => {
    const v = filled();
    v.assumptions.daylightFactor = { low: '0.6', central: '0.5', high: '' };
    expect(messages(v)['assumptions.daylightFactor.central']).toMatch(/low must not exceed central/);
  });
});

describe('formPathFor', () => {
  const modes = {
    routeMode: 'airports',
    cruiseMode: 'steps',
    emissionMode: 'aircraft',
    tropopauseMode: 'sounding',
  } as const;
  it.each([
    ['route.waypoints.1.airport', modes, 'airports.1.code'],
    ['route.waypoints.2.lon', { ...modes, routeMode: 'points' }, 'points.2.lon'],
    ['route.waypoints.2', { ...modes, routeMode: 'points' }, 'points.2.lat'],
    ['route.waypoints', modes, 'route'],
    ['cruise.steps.3.fromKm', modes, 'steps.3.from'],
    ['cruise.flightLevel', { ...modes, cruiseMode: 'level' }, 'flightLevel'],
    ['fuelBurnKg', modes, 'fuelBurn'],
    ['emission.eiNoxGPerKg', { ...modes, emissionMode: 'direct' }, 'eiNox'],
    ['emission.engine.fuelFlowKgS.2', modes, 'aircraft'],
    ['emission.engineCount', { ...modes, emissionMode: 'engine' }, 'engineCount'],
    ['tropopause.sounding.1.temperatureK', modes, 'soundingId'],
    ['assumptions.jNo2NoonPerS.high', modes, 'assumptions.jNo2NoonPerS.high'],
    ['assumptions.noxToNoyFraction', modes, 'assumptions.noxToNoyFraction.central'],
    ['whatIf.maxFuelPenaltyPct', modes, null],
  ] as const)('%s -> %s', (path, m, expected) => {
    expect(formPathFor(path, m)).toBe(expected);
  });
});

describe('the flight-plan route mode', () => {
  const fp = (flightPlan: ScreenFormValues['flightPlan']) => filled({ routeMode: 'flightPlan', flightPlan });

  it('sends route.flightPlan with upper-case codes; the body passes the engine schema', () => {
    const { body, problems } = screenFormProblems(
      fp({ text: ' n0480f350 DCT 62N020W DCT ', from: 'efhk', to: 'panc' }),
      ctx(),
    );
    expect(problems).toEqual([]);
    expect(body.route).toEqual({ flightPlan: { text: 'n0480f350 DCT 62N020W DCT', from: 'EFHK', to: 'PANC' } });
    const { aircraft: _a, name: _n, ...engine } = body;
    expect(screeningInputSchema.safeParse(engine).success).toBe(true);
  });

  it('empty text and aerodromes are problems beside their fields', () => {
    const { problems } = buildScreeningBody(fp({ text: '', from: '', to: '' }), ctx());
    expect(problems.map((p) => p.path)).toEqual(['flightPlan.text', 'flightPlan.from', 'flightPlan.to']);
  });

  it.each([
    ['route.flightPlan.text', 'flightPlan.text'],
    ['route.flightPlan.from', 'flightPlan.from'],
    ['route.flightPlan.to', 'flightPlan.to'],
    ['route.flightPlan', 'flightPlan.text'],
  ])('the API path %s is shown at %s', (server, form) => {
    expect(
      formPathFor(server, {
        routeMode: 'flightPlan',
        cruiseMode: 'level',
        emissionMode: 'aircraft',
        tropopauseMode: 'climatology',
      }),
    ).toBe(form);
  });
});
