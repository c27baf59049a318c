import { describe, expect, it } from 'vitest';
import { customIdOf, parseCalendarRef, periodContaining, previousPeriods } from '@/lib/periods/calendar';

describe('calendar periods', () => {
  it.each([
    ['2026', { kind: 'year', from: '2026-01-01', to: '2026-12-31', name: 'Year 2026' }],
    ['2026-Q1', { kind: 'quarter', from: '2026-01-01', to: '2026-03-31', name: 'Q1 2026' }],
    ['2024-Q1', { kind: 'quarter', from: '2024-01-01', to: '2024-03-31' }],
    ['2026-Q4', { kind: 'quarter', from: '2026-10-01', to: '2026-12-31' }],
    // Gregorian leap years: 2024 is one, 2100 is not (divisible by 100, not by 400).
    ['2024-02', { kind: 'month', from: '2024-02-01', to: '2024-02-29', name: 'February 2024' }],
    ['2100-02', { kind: 'month', from: '2100-02-01', to: '2100-02-28' }],
  ])('%s', (ref, expected) => {
    expect(parseCalendarRef(ref)).toMatchObject({ ref, ...expected });
  });

  it.each(['2026-Q0', '2026-Q5', '2026-13', '2026-00', '26', 'c12', '2026-1', ' 2026'])(
    '%s is not a calendar period',
    (ref) => {
      expect(parseCalendarRef(ref)).toBeNull();
    },
  );

  it('custom references carry their id', () => {
    expect(customIdOf('c12')).toBe(12);
    expect(customIdOf('c0')).toBeNull();
    expect(customIdOf('c99999999999')).toBeNull();
    expect(customIdOf('2026')).toBeNull();
  });

  it('the periods before one cross year ends, oldest first', () => {
    expect(previousPeriods(parseCalendarRef('2026-Q2')!, 4).map((p) => p.ref)).toEqual([
      '2025-Q2',
      '2025-Q3',
      '2025-Q4',
      '2026-Q1',
    ]);
    expect(previousPeriods(parseCalendarRef('2026-02')!, 3).map((p) => p.ref)).toEqual([
      '2025-11',
      '2025-12',
      '2026-01',
    ]);
    expect(previousPeriods(parseCalendarRef('2026')!, 2).map((p) => p.ref)).toEqual(['2024', '2025']);
  });

  it('a day belongs to its month, quarter and year', () => {
    expect(periodContaining('quarter', '2026-11-20').ref).toBe('2026-Q4');
    expect(periodContaining('quarter', '2026-03-31').ref).toBe('2026-Q1');
    expect(periodContaining('month', '2026-11-20').ref).toBe('2026-11');
    expect(periodContaining('year', '2026-11-20').ref).toBe('2026');
  });
});
