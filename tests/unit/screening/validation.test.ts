import { describe, expect, it } from 'vitest';
import { ScreeningInputError, screenFlight, validateScreeningInput } from '@/lib/screening';
import { screeningInputSchema } from '@/lib/validation/screening';

const good = () => ({
  route: { waypoints: [{ airport: 'EGLL' }, { lat: 52, lon: -20 }, { airport: 'KJFK' }] as unknown[] },
  cruise: { flightLevel: 350 } as Record<string, unknown>,
  fuelBurnKg: 20_000 as unknown,
  emission: {
    engine: { fuelFlowKgS: [0.11, 0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10, 22.5, 28.8] },
    engineCount: 2,
  } as Record<string, unknown>,
});

function problems(raw: unknown) {
  try {
    validateScreeningInput(raw);
  } catch (e) {
    expect(e).toBeInstanceOf(ScreeningInputError);
    return (e as ScreeningInputError).fields;
  }
  return [];
}

const set = (f: (x: ReturnType<typeof good>) => void) => {
  const x = good();
  f(x);
  return x;
};

describe('screening input schema', () => {
  it('accepts a good input and both cruise and emission forms', () => {
    expect(problems(good())).toEqual([]);
    expect(
      problems(
        set(
          (x) =>
            (x.cruise = {
              steps: [
                { fromKm: 0, flightLevel: 330 },
                { fromKm: 900, flightLevel: 350 },
              ],
            }),
        ),
      ),
    ).toEqual([]);
    expect(problems(set((x) => (x.emission = { eiNoxGPerKg: 14 })))).toEqual([]);
    expect(problems({ ...good(), month: 12, flightDate: '2024-02-29', mach: 2.2 })).toEqual([]);
  });

  it('leaves out a name (the handler adds it)', () => {
    const parsed = screeningInputSchema.parse({ ...good(), name: 'LHR-JFK' });
    expect(parsed).not.toHaveProperty('name');
  });

  it.each([
    [
      'latitude out of range',
      set((x) => (x.route.waypoints[1] = { lat: 95, lon: 0 })),
      'route.waypoints.1.lat',
      /between -90 and 90/,
    ],
    ['longitude missing', set((x) => (x.route.waypoints[1] = { lat: 10 })), 'route.waypoints.1.lon', /required/],
    [
      'waypoint with neither form',
      set((x) => (x.route.waypoints[2] = { name: 'TOPPA' })),
      'route.waypoints.2',
      /lat and lon, or as an airport/,
    ],
    [
      'waypoint with both forms',
      set((x) => (x.route.waypoints[0] = { airport: 'EGLL', lat: 1, lon: 1 })),
      'route.waypoints.0',
      /either/,
    ],
    [
      'bad airport code',
      set((x) => (x.route.waypoints[0] = { airport: 'LONDON' })),
      'route.waypoints.0.airport',
      /3 letters/,
    ],
    ['one waypoint', set((x) => (x.route.waypoints = [{ airport: 'EGLL' }])), 'route.waypoints', /at least 2/],
    [
      '501 waypoints',
      set((x) => (x.route.waypoints = Array.from({ length: 501 }, (_, i) => ({ lat: 0, lon: i / 10 })))),
      'route.waypoints',
      /at most 500/,
    ],
    [
      'flight level above 660',
      set((x) => (x.cruise = { flightLevel: 670 })),
      'cruise.flightLevel',
      /between 0 and 660/,
    ],
    ['fractional flight level', set((x) => (x.cruise = { flightLevel: 350.5 })), 'cruise.flightLevel', /whole number/],
    [
      'first step not at 0',
      set((x) => (x.cruise = { steps: [{ fromKm: 5, flightLevel: 330 }] })),
      'cruise.steps.0.fromKm',
      /start at 0 km/,
    ],
    [
      'steps not increasing',
      set(
        (x) =>
          (x.cruise = {
            steps: [
              { fromKm: 0, flightLevel: 330 },
              { fromKm: 900, flightLevel: 350 },
              { fromKm: 900, flightLevel: 370 },
            ],
          }),
      ),
      'cruise.steps.2.fromKm',
      /further along/,
    ],
    [
      '51 steps',
      set((x) => (x.cruise = { steps: Array.from({ length: 51 }, (_, i) => ({ fromKm: i * 10, flightLevel: 350 })) })),
      'cruise.steps',
      /at most 50/,
    ],
    ['fuel 0', set((x) => (x.fuelBurnKg = 0)), 'fuelBurnKg', /between 1 and 500000 kg/],
    ['fuel above 500 t', set((x) => (x.fuelBurnKg = 500_001)), 'fuelBurnKg', /between 1 and 500000 kg/],
    ['fuel as text', set((x) => (x.fuelBurnKg = '20000')), 'fuelBurnKg', /must be a number/],
    ['EI above 200', set((x) => (x.emission = { eiNoxGPerKg: 250 })), 'emission.eiNoxGPerKg', /between 0 and 200/],
    [
      'fuel flows not rising',
      set(
        (x) =>
          (x.emission = {
            engine: { fuelFlowKgS: [0.11, 0.33, 0.3, 1.21], eiNoxGPerKg: [4.6, 10, 22.5, 28.8] },
            engineCount: 2,
          }),
      ),
      'emission.engine.fuelFlowKgS.2',
      /higher than the approach/,
    ],
    [
      'negative fuel flow',
      set(
        (x) =>
          (x.emission = {
            engine: { fuelFlowKgS: [-0.1, 0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10, 22.5, 28.8] },
            engineCount: 2,
          }),
      ),
      'emission.engine.fuelFlowKgS.0',
      /above 0/,
    ],
    [
      'three modes',
      set(
        (x) =>
          (x.emission = {
            engine: { fuelFlowKgS: [0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10, 22.5, 28.8] },
            engineCount: 2,
          }),
      ),
      'emission.engine.fuelFlowKgS',
      /four fuel flows/,
    ],
    [
      'nine engines',
      set((x) => (x.emission = { ...x.emission, engineCount: 9 })),
      'emission.engineCount',
      /between 1 and 8/,
    ],
    ['unknown method', set((x) => (x.emission = { ...x.emission, method: 'p3t3' })), 'emission.method', /bffm2 or dlr/],
  ] as [string, unknown, string, RegExp][])('%s -> %s', (_name, raw, path, message) => {
    const p = problems(raw);
    const hit = p.find((x) => x.path === path);
    expect(hit, JSON.stringify(p)).toBeDefined();
    expect(hit!.message).toMatch(message);
  });

  it.each([
    [{ mach: 3.5 }, 'mach'],
    [{ mach: 0.05 }, 'mach'],
    [{ month: 13 }, 'month'],
    [{ month: 1.5 }, 'month'],
    [{ flightDate: '2026-02-30' }, 'flightDate'],
    [{ flightDate: '2026-2-3' }, 'flightDate'],
    [{ tropopause: { altitudeM: 100 } }, 'tropopause.altitudeM'],
    [{ tropopause: { pressureHpa: 900 } }, 'tropopause.pressureHpa'],
    [{ tropopause: { sounding: [{ altitudeM: 1, temperatureK: 250 }] } }, 'tropopause.sounding'],
    [
      {
        tropopause: {
          sounding: [
            { altitudeM: 1, temperatureK: 250 },
            { altitudeM: 1, temperatureK: 240 },
            { altitudeM: 9, temperatureK: 230 },
          ],
        },
      },
      'tropopause.sounding.1.altitudeM',
    ],
    [{ assumptions: { jO3NoonPerS: { central: 1e-4, low: 2e-4, high: 3e-4 } } }, 'assumptions.jO3NoonPerS'],
    [{ assumptions: { relativeHumidity: 60 } }, 'assumptions.relativeHumidity'],
    [{ assumptions: { ozoneProfile: 'arctic' } }, 'assumptions.ozoneProfile'],
    [{ assumptions: { residenceTime: { depthKm: [1, 2], years: [0.1, 0.2] } } }, 'assumptions.residenceTime.depthKm.0'],
    [{ assumptions: { colour: 'red' } }, 'assumptions'],
  ] as [Record<string, unknown>, string][])('%j -> %s', (extra, path) => {
    expect(problems({ ...good(), ...extra }).map((p) => p.path)).toContain(path);
  });

  it('lists every bad field at once', () => {
    const p = problems({ ...good(), fuelBurnKg: -1, month: 0, cruise: { flightLevel: 999 } });
    expect(p.map((x) => x.path).sort()).toEqual(['cruise.flightLevel', 'fuelBurnKg', 'month']);
  });

  it('rejects a non-object and missing parts with plain messages', () => {
    expect(problems(null)[0].message).toMatch(/must be an object/);
    expect(problems('x')[0].message).toMatch(/must be an object/);
    const p = problems({});
    expect(p.map((x) => x.path).sort()).toEqual(['cruise', 'emission', 'fuelBurnKg', 'route']);
  });

  it('screenFlight throws the same error class', () => {
    expect(() => screenFlight({ ...good(), fuelBurnKg: 0 })).toThrow(ScreeningInputError);
  });
});
