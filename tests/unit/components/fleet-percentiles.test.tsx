// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import { FleetPercentiles } from '@/components/fleets/fleet-percentiles';
import { FleetPack, encodeFlightComponents, flightComponents, sampleFleetParts } from '@/lib/screening';
import { screenValidated, validateScreeningInput } from '@/lib/screening';
import { FLEET_PERCENTILES_NOTE } from '@/lib/fleets/percentiles-note';
import type { FleetPercentiles as Percentiles } from '@/lib/fleets/types';
import { formatMassRange } from '@/lib/format';

afterEach(cleanup);

/** Two invented fleets of direct-EI flights across the North Atlantic, sampled as the product does. */
function sampled(): Percentiles {
  const packs = [new FleetPack(), new FleetPack()];
  for (let i = 0; i < 8; i++) {
    const input = validateScreeningInput({
      route: {
        waypoints: [
          { lat: 40 + i, lon: -60 },
          { lat: 50 + i, lon: -10 },
        ],
      },
      cruise: { flightLevel: 330 + 10 * i },
      fuelBurnKg: 25_000,
      emission: { eiNoxGPerKg: 14 },
      month: 1 + i,
    });
    packs[i % 2].addEncoded(encodeFlightComponents(flightComponents(input, screenValidated(input))));
  }
  const { total, parts } = sampleFleetParts(packs, { samples: 400, seed: 1 });
  const row = (fleetId: number | null, u: typeof total) => ({
    fleetId,
    flights: u.flights,
    flightsSampled: u.flights,
    noxAboveTropopauseKg: u.noxAboveTropopauseKg,
    fractionAboveTropopause: u.fractionAboveTropopause,
    ozoneLossKg: u.ozoneLossKg,
  });
  return {
    samples: 400,
    seed: 1,
    engineVersion: 'test',
    fleets: [row(1, parts[0]), row(2, parts[1])],
    total: row(null, total),
    flightsLeftOut: 0,
    correlation: total.correlation,
    note: FLEET_PERCENTILES_NOTE,
  };
}

describe('fleet percentiles card', () => {
  it("shows each fleet's 5-95 % band and the total's, with the plain-words note", () => {
    const p = sampled();
    render(
      <FleetPercentiles
        percentiles={p}
        names={[
          { fleetId: 1, fleetName: 'North' },
          { fleetId: 2, fleetName: 'South' },
        ]}
        units="metric"
      />,
    );
    const table = screen.getByTestId('fleet-percentiles');
    const rows = within(table).getAllByRole('row');
    expect(rows.map((r) => r.textContent)).toEqual([
      expect.stringContaining('NOx above tropopause, 5–95 %'),
      expect.stringContaining('North'),
      expect.stringContaining('South'),
      expect.stringContaining('All fleets'),
    ]);
    const total = p.total.noxAboveTropopauseKg;
    expect(rows[3].textContent).toContain(formatMassRange(total.p5, total.p95, 'metric'));
    expect(screen.getByText(/half shared by the flights of the same 10-degree latitude band and month/)).toBeTruthy();
  });
});
