import { describe, expect, it } from 'vitest';
import { massAxisUnit, monthLabel, niceTicks } from '@/lib/fleets/units';
import { monthsOf, resolvePeriod, routeTerms } from '@/lib/fleets/compare';

describe('chart axes of the report and the page', () => {
  it.each([
    [0, [0, 1]],
    [7, [0, 2, 4, 6, 8]],
    [23.4, [0, 5, 10, 15, 20, 25]],
    [100, [0, 20, 40, 60, 80, 100]],
    [0.37, [0, 0.1, 0.2, 0.3, 0.4]],
    [1234, [0, 250, 500, 750, 1000, 1250]],
  ])('niceTicks(%s)', (max, ticks) => {
    expect(niceTicks(max)).toEqual(ticks);
  });

  it('every tick set starts at 0 and reaches the maximum', () => {
    for (const max of [0.001, 3, 9.99, 42, 999, 12345.6, 7e7]) {
      const t = niceTicks(max);
      expect(t[0]).toBe(0);
      expect(t[t.length - 1]).toBeGreaterThanOrEqual(max);
      expect(t.length).toBeLessThanOrEqual(8);
    }
  });

  it('mass axis: kg below 10 t, tonnes above, pounds in aviation units (1 lb = 0.45359237 kg, exact by definition)', () => {
    expect(massAxisUnit(9_999, 'metric')).toEqual({ unit: 'kg', perKg: 1 });
    expect(massAxisUnit(10_000, 'metric')).toEqual({ unit: 't', perKg: 0.001 });
    expect(massAxisUnit(10, 'imperial').perKg).toBeCloseTo(1 / 0.45359237, 12);
    expect(monthLabel('2026-09')).toBe('Sep 2026');
  });
});

describe('comparison period and route words', () => {
  it('defaults to the current month and the two before it, up to today', () => {
    expect(resolvePeriod({}, '2026-11-20')).toEqual({ from: '2026-09-01', to: '2026-11-20', days: 81 });
    expect(resolvePeriod({ to: '2026-02-10' }, '2026-11-20')).toEqual({
      from: '2025-12-01',
      to: '2026-02-10',
      days: 72,
    });
    expect(resolvePeriod({ from: '2026-11-01' }, '2026-11-20').to).toBe('2026-11-20');
  });

  it('a leap-year February counts 29 days', () => {
    expect(resolvePeriod({ from: '2028-02-01', to: '2028-02-29' }).days).toBe(29);
  });

  it('refuses an inverted period with the field named', () => {
    expect(() => resolvePeriod({ from: '2026-12-01' }, '2026-11-20')).not.toThrow();
    try {
      resolvePeriod({ from: '2026-11-02', to: '2026-11-01' });
      expect.unreachable();
    } catch (err) {
      expect((err as { fields: { path: string }[] }).fields[0].path).toBe('to');
    }
  });

  it('months of a period cross the year', () => {
    expect(monthsOf('2026-11-15', '2027-02-01')).toEqual(['2026-11', '2026-12', '2027-01', '2027-02']);
  });

  it('route words match ICAO and IATA codes of the same airport (OurAirports: LHR is EGLL)', () => {
    expect(routeTerms('lhr-KSFO')).toEqual([
      ['LHR', 'EGLL'],
      ['KSFO', 'SFO'],
    ]);
    expect(routeTerms('  ')).toBeUndefined();
    expect(routeTerms('ZZZZ')).toEqual([['ZZZZ']]);
  });
});
