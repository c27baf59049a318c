// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import type { ScreeningSegment } from '@/lib/screening';

vi.mock('next/navigation', () => ({
  useRouter: () => ({ replace: vi.fn() }),
  usePathname: () => '/w/demo/screenings/1',
  useSearchParams: () => new URLSearchParams(),
}));

const { SegmentTable, TROPOPAUSE_HEADER_TITLE } = await import('@/components/screening/segment-table');

afterEach(cleanup);

/** One invented cruise segment at FL360 under a tropopause at ISA 10 363.2 m (34 000 ft), 250 hPa. */
const segment: ScreeningSegment = {
  startKm: 0,
  endKm: 50,
  lat: 55,
  lon: -20,
  flightLevel: 360,
  altitudeM: 10_973,
  tropopauseM: 10_363.2,
  tropopausePressureHpa: 250,
  tropopauseSource: 'climatology',
  fuelKg: 300,
  noxKg: 4.2,
  aboveTropopause: true,
  depthAboveTropopauseKm: 0.61,
  ozoneLossKg: 0.5,
} as ScreeningSegment;

describe('segment table: the tropopause column', () => {
  it('says the tropopause is a pressure altitude and shows its pressure beside it', () => {
    render(<SegmentTable segments={[segment]} units="metric" />);
    const header = screen.getByRole('columnheader', { name: /Tropopause \(pressure alt\.\)/ });
    expect(within(header).getByTitle(TROPOPAUSE_HEADER_TITLE)).toBeTruthy();
    expect(TROPOPAUSE_HEADER_TITLE).toMatch(/pressure altitude/);
    const cells = within(screen.getByTestId('segment-table')).getAllByRole('cell');
    expect(cells.map((c) => c.textContent)).toContain('10,363 m · 250 hPa');
  });

  it('in the imperial preference the altitude is in feet and the pressure stays in hPa', () => {
    render(<SegmentTable segments={[segment]} units="imperial" />);
    const cells = within(screen.getByTestId('segment-table')).getAllByRole('cell');
    // 10 363.2 m / 0.3048 m per ft = 34 000 ft (the foot is 0.3048 m by definition).
    expect(cells.map((c) => c.textContent)).toContain('34,000 ft · 250 hPa');
  });
});
