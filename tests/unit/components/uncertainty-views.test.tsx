// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import { MonthStrip } from '@/components/screening/month-strip';
import { UncertaintyDriversChart } from '@/components/screening/uncertainty-drivers';
import { HeadlineFigures } from '@/components/screening/headline-figures';
import { ScreeningPreview } from '@/components/screening/screening-preview';
import { SAME_EVERY_MONTH_NOTE, screenAcrossMonths, screenFlight } from '@/lib/screening';

afterEach(cleanup);

const FLIGHT = {
  route: {
    waypoints: [
      { lat: 45, lon: -40 },
      { lat: 45, lon: -10 },
    ],
  },
  cruise: { flightLevel: 350 },
  fuelBurnKg: 20_000,
  emission: { eiNoxGPerKg: 14 },
  month: 2,
};

describe('uncertainty and season views', () => {
  it('month strip: 12 months, the planned one marked, heights following NOx above', () => {
    const rows = screenAcrossMonths(FLIGHT);
    render(<MonthStrip rows={rows} plannedMonth={2} units="metric" />);
    const items = within(screen.getByRole('list', { name: 'NOx above the tropopause in each month' })).getAllByRole(
      'listitem',
    );
    expect(items).toHaveLength(12);
    expect(items.filter((li) => li.getAttribute('aria-current') === 'date')).toEqual([items[1]]);
    expect(items[1].textContent).toMatch(/February: .* \(planned month\)/);
    expect(screen.getByText(/planned month \(February\) is outlined/)).toBeTruthy();
  });

  it('drivers chart: bars ranked, the leading input named in a sentence', () => {
    const r = screenFlight({ ...FLIGHT, uncertainty: { samples: 100 } });
    const d = r.uncertainty!.drivers;
    render(<UncertaintyDriversChart drivers={d} />);
    const lead = d.noxAboveTropopauseKg[0];
    // In the sentence the label keeps its abbreviations: "the cruise EI NOx", never "the cruise ei nox".
    const inSentence = lead.label
      .replace(/^[A-Z](?=[a-z])/, (c) => c.toLowerCase())
      .replace(/[()[\]/.*+?^$|]/g, '\\$&');
    expect(screen.getByText(new RegExp(`The ${inSentence} explains \\d+ % of the spread of NOx above`))).toBeTruthy();
    const list = screen.getByRole('list', { name: /spread of nox above the tropopause/i });
    const labels = within(list)
      .getAllByRole('listitem')
      .map((li) => li.textContent ?? '');
    expect(labels[0]).toContain(lead.label);
  });

  it('headline: the 5-95 % band leads and the all-corners band stays as the screening range', () => {
    const r = screenFlight({ ...FLIGHT, uncertainty: { samples: 100 } });
    render(<HeadlineFigures result={r} units="metric" bands={r.uncertainty} />);
    expect(screen.getAllByTestId('band-5-95').length).toBe(2);
    expect(screen.getByText(/screening range/)).toBeTruthy();
  });

  it('screen page preview: the 5-95 % band, the drivers and the month strip from the preview answer', () => {
    const result = screenFlight({ ...FLIGHT, tropopause: { altitudeM: 10_400 }, uncertainty: { samples: 100 } });
    const rows = screenAcrossMonths({ ...FLIGHT, tropopause: { altitudeM: 10_400 } });
    render(
      <ScreeningPreview
        units="metric"
        data={{
          input: FLIGHT,
          aircraft: null,
          result,
          levels: [],
          months: { rows, sameEveryMonth: true, note: SAME_EVERY_MONTH_NOTE },
        }}
        waitingFor={[]}
        fetching={false}
        stale={false}
        error={null}
        limit="2"
        limitError={null}
        limitPct={2}
        ratePct={1}
        onLimitChange={() => undefined}
      />,
    );
    expect(screen.getAllByTestId('band-5-95').length).toBeGreaterThan(0);
    expect(screen.getByTestId('drivers-chart')).toBeTruthy();
    expect(within(screen.getByTestId('month-strip')).getAllByRole('listitem')).toHaveLength(12);
    expect(screen.getByText(/does not change with the month/)).toBeTruthy();
  });
});
