import { describe, expect, it } from 'vitest';
import { engineCsvTemplate, parseEnginesCsv } from '@/lib/imports/engines-csv';
import { parseSoundingCsv, soundingCsvTemplate } from '@/lib/imports/soundings-csv';
import { tropopauseFromSounding } from '@/lib/screening';

const HEADER =
  'name,idle_ff_kg_s,approach_ff_kg_s,climb_out_ff_kg_s,take_off_ff_kg_s,idle_ei,approach_ei,climb_out_ei,take_off_ei,source';
const none = new Set<string>();

describe('parseEnginesCsv', () => {
  it('reads engines in the ICAO mode order, with source optional', () => {
    const r = parseEnginesCsv(`${HEADER.replace(',source', '')}\nA,0.1,0.3,0.9,1.1,4,10,22,30\n`, {
      existingNames: none,
    });
    expect(r.problems).toEqual([]);
    expect(r.engines).toEqual([
      { name: 'A', fuelFlowKgS: [0.1, 0.3, 0.9, 1.1], eiNoxGPerKg: [4, 10, 22, 30], source: '' },
    ]);
  });

  it('maps each schema problem to its column; one bad row means no engines at all', () => {
    const r = parseEnginesCsv(
      `${HEADER}\nGood,0.1,0.3,0.9,1.1,4,10,22,30,\nBad,0.1,0.3,0.9,0.8,4,0,22,30,\n,0.1,0.3,0.9,1.1,4,10,22,,\n`,
      { existingNames: none },
    );
    expect(r.engines).toEqual([]);
    expect(r.problems.map((p) => `${p.line}:${p.column}`)).toEqual([
      '3:take_off_ff_kg_s',
      '3:approach_ei',
      '4:name',
      '4:take_off_ei',
    ]);
    expect(r.problems[0].message).toContain('take-off fuel flow must be higher than the climb-out');
  });

  it('refuses names already in the workspace, case-insensitively', () => {
    const r = parseEnginesCsv(`${HEADER}\nOLD ONE,0.1,0.3,0.9,1.1,4,10,22,30,\n`, {
      existingNames: new Set(['old one']),
    });
    expect(r.problems).toEqual([
      { line: 2, column: 'name', message: expect.stringContaining('already in this workspace') },
    ]);
  });

  it('a header with no rows is a problem; the template reads cleanly', () => {
    expect(parseEnginesCsv(`${HEADER}\n`, { existingNames: none }).problems).toEqual([
      { line: 2, column: '', message: expect.stringContaining('no engines') },
    ]);
    const t = parseEnginesCsv(engineCsvTemplate(), { existingNames: none });
    expect(t.problems).toEqual([]);
    expect(t.engines).toHaveLength(1);
  });
});

describe('parseSoundingCsv', () => {
  it('converts temperature_c to kelvin (T[K] = T[°C] + 273.15) and keeps levels in file order', () => {
    const r = parseSoundingCsv('ALTITUDE_M,temperature_c\n0,15\n1000,8.5\n2000,2\n');
    expect(r.problems).toEqual([]);
    expect(r.temperatureColumn).toBe('temperature_c');
    expect(r.levels.map((l) => l.temperatureK)).toEqual([288.15, 281.65, 275.15]);
    expect(r.lines).toEqual([2, 3, 4]);
  });

  it('a temperature out of range in °C is reported in °C on its column', () => {
    const r = parseSoundingCsv('altitude_m,temperature_c\n0,15\n1000,288\n2000,2\n');
    expect(r.problems).toEqual([{ line: 3, column: 'temperature_c', message: expect.stringContaining('°C') }]);
  });

  it('header problems: no height column, no temperature, both temperature columns', () => {
    expect(parseSoundingCsv('temperature_k\n288\n').problems.map((p) => p.column)).toEqual(['altitude_m']);
    expect(parseSoundingCsv('altitude_m\n0\n').problems.map((p) => p.column)).toEqual(['temperature_k']);
    expect(
      parseSoundingCsv('altitude_m,temperature_k,temperature_c\n0,288,15\n').problems.map((p) => p.column),
    ).toEqual(['temperature_c']);
  });

  it('fewer than 3 levels is a problem of the whole file, reported on line 1', () => {
    const r = parseSoundingCsv('altitude_m,temperature_k\n0,288\n1000,281\n');
    expect(r.problems).toEqual([{ line: 1, column: '', message: expect.stringContaining('at least 3') }]);
    expect(r.levels).toEqual([]);
  });

  it('the template (ISA levels, ICAO Doc 7488/3) gives the ISA tropopause at 11 000 m', () => {
    const r = parseSoundingCsv(soundingCsvTemplate());
    expect(r.problems).toEqual([]);
    // The ISA lapse rate is 6.5 K/km below 11 km and 0 above (ICAO Doc 7488/3); by the WMO (1957) definition the tropopause is at 11 km.
    expect(tropopauseFromSounding(r.levels)?.altitudeM).toBeCloseTo(11_000, 3);
  });
});
