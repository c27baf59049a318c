// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { WhatIfTable } from '@/components/screening/what-if-table';
import { compareCruiseLevels } from '@/lib/screening';

const flight = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 350 },
  fuelBurnKg: 30_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

afterEach(cleanup);

describe('what-if table', () => {
  it('names the mark after what it minimises, keeps the net-production caution beside it, and shows the fuel and CO2 change of each level', () => {
    const rows = compareCruiseLevels(flight, { minimise: 'nox-above-tropopause' });
    render(<WhatIfTable rows={rows} units="metric" limitPct={2} ratePctPer1000Ft={1} />);
    const marked = document.querySelector('tr[data-lowest-impact="true"]');
    expect(marked?.textContent).toMatch(/Least NOx above the tropopause/);
    expect(screen.getByText(/gives the least NOx above the tropopause/)).toBeTruthy();
    expect(screen.getByText(/net production/)).toBeTruthy();
    // +2000 ft: 2 % more fuel, 600 kg, and 3.16 x 600 = 1896 kg CO2.
    expect(document.body.textContent).toMatch(/\+600 kg/);
    expect(document.body.textContent).toMatch(/CO2 \+1[ ,.]?896 kg/);
  });

  it('says "Least ozone figure" when that is what the planner minimises', () => {
    render(<WhatIfTable rows={compareCruiseLevels(flight)} units="metric" limitPct={2} ratePctPer1000Ft={1} />);
    expect(document.querySelector('tr[data-lowest-impact="true"]')?.textContent).toMatch(/Least ozone figure/);
  });
});
