import { describe, expect, it } from 'vitest';
import {
  aircraftTypeSaveSchema,
  engineSaveSchema,
  observedAtSchema,
  parseWaypointLines,
  routeFormSchema,
  formatWaypointLines,
} from '@/lib/validation/library';
import { cruiseEiCheck, TYPICAL_CRUISE_EI_G_PER_KG } from '@/lib/library/cruise-ei-check';
import { flightLevelToMetres, isa } from '@/lib/screening/atmosphere';
import { BFFM2_INSTALLATION_FACTORS, bffm2EiNox, buildEiCurve } from '@/lib/screening/emission-index';

describe('route form', () => {
  it('reads codes (several per line) and lat, lon lines; blank lines skipped', () => {
    expect(parseWaypointLines('egll lhr\n\n 64.13, -21.94 \n-33.9 151.2\nKSFO')).toEqual([
      { airport: 'EGLL' },
      { airport: 'LHR' },
      { lat: 64.13, lon: -21.94 },
      { lat: -33.9, lon: 151.2 },
      { airport: 'KSFO' },
    ]);
  });

  it('round-trips through formatWaypointLines', () => {
    const w = [{ airport: 'EGLL' }, { lat: 80, lon: -60.5 }, { airport: 'KSEA' }];
    expect(parseWaypointLines(formatWaypointLines(w))).toEqual(w);
  });

  it('puts waypoint problems on the box with the waypoint number', () => {
    const r = routeFormSchema.safeParse({ name: 'x', waypointsText: 'EGLL\n95, 0', notes: '' });
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['waypointsText', expect.stringMatching(/^Waypoint 2: Latitude must be between -90 and 90/)],
    ]);
    const one = routeFormSchema.safeParse({ name: '', waypointsText: 'EGLL', notes: '' });
    expect(one.error?.issues.map((i) => i.path.join('.')).sort()).toEqual(['name', 'waypointsText']);
  });
});

describe('engine and aircraft type schemas', () => {
  it('an engine needs rising fuel flows and EI above 0 up to 200 g/kg', () => {
    const ok = engineSaveSchema.safeParse({
      name: 'E',
      fuelFlowKgS: [0.1, 0.3, 0.9, 1.1],
      eiNoxGPerKg: [4, 10, 22, 200],
    });
    expect(ok.success).toBe(true);
    const bad = engineSaveSchema.safeParse({
      name: 'E',
      fuelFlowKgS: [0.1, 0.1, 0.9, 1.1],
      eiNoxGPerKg: [4, 10, 22, 200.1],
    });
    expect(bad.error?.issues.map((i) => i.path.join('.')).sort()).toEqual(['eiNoxGPerKg.3', 'fuelFlowKgS.1']);
  });

  it('a type code is stored in capitals; an engine or a direct EI, exactly one', () => {
    const base = { engineCount: 2, typicalMach: 0.8, typicalFlightLevel: 350 };
    expect(aircraftTypeSaveSchema.parse({ ...base, code: ' sk-lr9 ', engineId: 3 })).toMatchObject({
      code: 'SK-LR9',
      engineId: 3,
      directEiGPerKg: null,
      defaultFleetId: null,
      name: '',
    });
    expect(aircraftTypeSaveSchema.safeParse({ ...base, code: 'A', directEiGPerKg: 0 }).success).toBe(true);
    expect(aircraftTypeSaveSchema.safeParse({ ...base, code: 'A' }).error?.issues[0].path).toEqual(['engineId']);
  });
});

describe('observation time', () => {
  it.each([
    ['', null],
    [undefined, null],
    ['2026-11-20', '2026-11-20T00:00:00.000Z'],
    ['2026-11-20T12:30', '2026-11-20T12:30:00.000Z'],
    ['2026-11-20 06:00Z', '2026-11-20T06:00:00.000Z'],
    ['2026-11-20T12:00+0200', '2026-11-20T10:00:00.000Z'],
  ])('%j -> %j', (input, expected) => {
    expect(observedAtSchema.parse(input)).toBe(expected);
  });

  it.each(['2026-02-30', '2026-11-20T25:00', 'tomorrow', '20/11/2026'])('%j is refused', (input) => {
    expect(observedAtSchema.safeParse(input).success).toBe(false);
  });
});

describe('cruise EI check', () => {
  it('is the BFFM2 EI at FL350, M0.80, ISA and 30 % of take-off fuel flow; doubling every certification EI doubles it', () => {
    const engine = { fuelFlowKgS: [0.1, 0.3, 0.9, 1.1] as const, eiNoxGPerKg: [4.5, 10.2, 22.8, 30.5] as const };
    const air = isa(flightLevelToMetres(350));
    const direct = bffm2EiNox(buildEiCurve(engine, BFFM2_INSTALLATION_FACTORS), {
      fuelFlowPerEngineKgS: 0.33,
      pressurePa: air.pressurePa,
      temperatureK: air.temperatureK,
      mach: 0.8,
    });
    expect(cruiseEiCheck(engine).eiNoxGPerKg).toBeCloseTo(direct.eiNoxGPerKg, 12);
    const doubled = {
      ...engine,
      eiNoxGPerKg: engine.eiNoxGPerKg.map((e) => e * 2) as unknown as readonly [number, number, number, number],
    };
    const a = cruiseEiCheck(engine);
    const b = cruiseEiCheck(doubled);
    // BFFM2 is linear in the curve's EI (DuBois & Paynter 2006): doubling every certification EI doubles the result.
    expect(b.eiNoxGPerKg / a.eiNoxGPerKg).toBeCloseTo(2, 9);
    expect(a.fuelFlowPerEngineKgS).toBeCloseTo(0.33, 12);
  });

  it('flags values outside the typical 10-20 g/kg of modern subsonic turbofans (common practice)', () => {
    const low = cruiseEiCheck({ fuelFlowKgS: [0.1, 0.3, 0.9, 1.1], eiNoxGPerKg: [1, 2, 3, 4] });
    const high = cruiseEiCheck({ fuelFlowKgS: [0.1, 0.3, 0.9, 1.1], eiNoxGPerKg: [20, 40, 80, 120] });
    expect(low.eiNoxGPerKg).toBeLessThan(TYPICAL_CRUISE_EI_G_PER_KG.low);
    expect(low.band).toBe('low');
    expect(high.band).toBe('high');
  });
});
