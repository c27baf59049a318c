import { describe, expect, it } from 'vitest';
import { tropopauseMonthLabel } from '@/components/screening/describe';

describe("a screening result's tropopause label", () => {
  it.each([
    [{ month: 1 }, { month: 1 }, 'January tropopause'],
    [{ month: 12 }, { month: 12 }, 'December tropopause'],
    [{ flightDate: '2026-11-20' }, { month: 11 }, 'flight date 2026-11-20'],
    // The engine takes a given month over the date's month: both are named when they differ.
    [{ flightDate: '2026-11-20', month: 1 }, { month: 1 }, 'flight date 2026-11-20 · January tropopause'],
    [{}, { month: null }, 'annual-mean tropopause'],
  ] as const)('%j -> %s', (input, result, expected) => {
    expect(tropopauseMonthLabel(input, result)).toBe(expected);
  });
});
