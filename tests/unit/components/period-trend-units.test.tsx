// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import { PeriodFleetsCard, PeriodTrendCard } from '@/components/periods/period-figure-tables';
import type { PeriodFigures, TrendPoint } from '@/lib/periods/service';

afterEach(cleanup);

const figures = (noxAboveKg: number, distanceKm: number): PeriodFigures => ({
  flights: 10,
  distanceKm,
  noxTotalKg: noxAboveKg * 3,
  noxAboveKg,
  shareAbove: 1 / 3,
  noxAbovePer1000KmKg: (noxAboveKg / distanceKm) * 1000,
});

const point = (ref: string, noxAboveKg: number): TrendPoint => ({
  ref,
  name: ref,
  state: 'open',
  figures: figures(noxAboveKg, 400_000),
  targets: [],
});

/** The texts of one column of the table (0-based), header row left out. */
function column(table: HTMLElement, index: number): string[] {
  return within(table)
    .getAllByRole('row')
    .slice(1)
    .map((row) => (row.querySelectorAll('td')[index]?.textContent ?? '').trim());
}

describe('period figure tables: one mass unit per column', () => {
  it('the trend shows 17.4 t beside 9.7 t, not beside 9,733 kg', () => {
    render(
      <PeriodTrendCard
        slug="demo"
        current="2026-Q4"
        trend={[point('2026-Q4', 17_400), point('2026-Q3', 9_733), point('2026-Q2', 40)]}
        units="metric"
      />,
    );
    const table = screen.getByRole('table');
    expect(column(table, 3)).toEqual(['17.4 t', '9.7 t', '< 0.1 t']);
    // Per 1000 km: 17 400 / 400 000 km x 1000 = 43.5 kg, the largest, so the column stays in kg.
    expect(column(table, 5)).toEqual(['44 kg per 1000 km', '24 kg per 1000 km', '0.10 kg per 1000 km']);
  });

  it('the fleets card picks its column unit from its own largest fleet', () => {
    render(
      <PeriodFleetsCard
        fleets={[
          { fleetId: 1, fleetName: 'Long haul', ...figures(9_733, 100_000) },
          { fleetId: 2, fleetName: 'Regional', ...figures(812, 20_000) },
        ]}
        units="metric"
      />,
    );
    expect(column(screen.getByRole('table'), 2)).toEqual(['9,733 kg', '812 kg']);
  });

  it('in the imperial preference every cell of the column is in pounds', () => {
    render(
      <PeriodTrendCard slug="demo" current="a" trend={[point('a', 17_400), point('b', 9_733)]} units="imperial" />,
    );
    // 17 400 kg / 0.45359237 kg per lb = 38 360 lb; 9 733 kg = 21 458 lb (lb defined as 0.45359237 kg).
    expect(column(screen.getByRole('table'), 3)).toEqual(['38,360 lb', '21,458 lb']);
  });
});
