import { describe, expect, it } from 'vitest';
import { formatMass, formatMassIn, formatMassRange, formatMonth, massColumnUnit } from '@/lib/format';

describe('formatMassRange', () => {
  it('shows both ends in the unit of the larger one', () => {
    expect(formatMassRange(5_169, 399_000, 'metric')).toBe('5.2 – 399.0 t');
    expect(formatMassRange(46.1, 3_569.8, 'metric')).toBe('46 – 3,570 kg');
    expect(formatMassRange(0.12, 4.5, 'metric')).toBe('0.12 – 4.50 kg');
    expect(formatMassRange(12_000, 80_000, 'metric', ' to ')).toBe('12.0 to 80.0 t');
  });

  it('in aviation units, pounds at both ends', () => {
    // 1 lb = 0.45359237 kg exactly (international avoirdupois pound).
    expect(formatMassRange(0.45359237, 45.359237, 'imperial')).toBe('1 – 100 lb');
  });

  it('agrees with formatMass where both ends fall in the same unit', () => {
    expect(formatMassRange(20_000, 30_000, 'metric')).toBe(
      `${formatMass(20_000, 'metric').replace(' t', '')} – ${formatMass(30_000, 'metric')}`,
    );
  });
});

describe('formatMass', () => {
  it('an exact zero (an empty month) shows without decimals; small masses keep two', () => {
    expect(formatMass(0, 'metric')).toBe('0 kg');
    expect(formatMass(0, 'imperial')).toBe('0 lb');
    expect(formatMass(4.5, 'metric')).toBe('4.50 kg');
    expect(formatMass(0.004, 'metric')).toBe('0.00 kg');
    expect(formatMass(12_345, 'metric')).toBe('12.3 t');
    // 1 lb = 0.45359237 kg exactly (international avoirdupois pound).
    expect(formatMass(0.45359237 * 3, 'imperial')).toBe('3.00 lb');
  });
});

describe('formatMonth', () => {
  it('names the month and keeps the whole year, so it cannot be read as a day', () => {
    expect(formatMonth('2026-06')).toBe('Jun 2026');
    expect(formatMonth('2025-12')).toBe('Dec 2025');
    expect(formatMonth('2026-13')).toBe('2026-13');
    expect(formatMonth('June')).toBe('June');
  });
});

describe('massColumnUnit and formatMassIn: one unit per table column', () => {
  it('a column whose largest value reaches 10 t shows every cell in tonnes, smaller cells included', () => {
    const column = [17_400, 9_733, 0];
    const unit = massColumnUnit(column, 'metric');
    expect(unit).toBe('t');
    expect(column.map((kg) => formatMassIn(kg, unit))).toEqual(['17.4 t', '9.7 t', '0 t']);
    // formatMass on its own would mix units within the same column.
    expect(column.map((kg) => formatMass(kg, 'metric'))).toEqual(['17.4 t', '9,733 kg', '0 kg']);
  });

  it('a column whose values all stay under 10 t stays in kg, with two decimals below 10 kg', () => {
    const column = [9_999, 412.4, 3.456];
    const unit = massColumnUnit(column, 'metric');
    expect(unit).toBe('kg');
    expect(column.map((kg) => formatMassIn(kg, unit))).toEqual(['9,999 kg', '412 kg', '3.46 kg']);
  });

  it('a tiny non-zero mass in a tonnes column says it is under 0.1 t rather than 0.0 t', () => {
    expect(formatMassIn(40, 't')).toBe('< 0.1 t');
    expect(formatMassIn(50, 't')).toBe('0.1 t');
  });

  it('the imperial preference shows the whole column in pounds (1 lb = 0.45359237 kg, by definition)', () => {
    expect(massColumnUnit([17_400, 9_733], 'imperial')).toBe('lb');
    expect(formatMassIn(45.359237, 'lb')).toBe('100 lb');
  });

  it('missing or non-finite values neither choose the unit nor break a cell', () => {
    expect(massColumnUnit([null, undefined, Number.NaN, 120], 'metric')).toBe('kg');
    expect(massColumnUnit([], 'metric')).toBe('kg');
    expect(massColumnUnit([-12_000, 5], 'metric')).toBe('t');
    expect(formatMassIn(Number.NaN, 't')).toBe('–');
  });
});
