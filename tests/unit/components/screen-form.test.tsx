// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { ScreenFlightForm, type ScreenFlightFormProps } from '@/components/screening/screen-form';
import type { AssumptionDefaults } from '@/components/screening/screen-form-adapter';

const defaults: AssumptionDefaults = {
  jO3NoonPerS: { low: 3e-4, central: 4.5e-4, high: 6e-4 },
  jNo2NoonPerS: { low: 0.008, central: 0.01, high: 0.015 },
  daylightFactor: { low: 0.3, central: 0.4, high: 0.5 },
  noxToNoyFraction: { low: 0.1, central: 0.2, high: 0.4 },
  ohCm3: 1e6,
  ho2Cm3: 5e6,
  relativeHumidity: 0.6,
  residenceTime: { depthKm: [0, 1, 2], years: [0.1, 0.25, 0.5], lowFactor: 0.5, highFactor: 2 },
};

function renderForm(patch: Partial<ScreenFlightFormProps> = {}) {
  const onSaved = vi.fn();
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  const props: ScreenFlightFormProps = {
    slug: 'test-air',
    units: 'metric',
    defaults,
    defaultDate: '2026-11-20',
    aircraft: [
      {
        code: 'T-LR',
        name: 'Test long-range twin',
        engineName: 'Test turbofan',
        engineCount: 2,
        typicalMach: 0.85,
        typicalFlightLevel: 370,
        directEiGPerKg: null,
        emission: {
          engine: { fuelFlowKgS: [0.1, 0.3, 0.9, 1.1], eiNoxGPerKg: [5, 11, 23, 30] },
          engineCount: 2,
          mach: 0.85,
        },
      },
    ],
    engines: [],
    routes: [],
    soundings: [],
    whatIfDefaults: { limitPct: 2, ratePct: 1 },
    onSaved,
    ...patch,
  };
  const view = render(
    <QueryClientProvider client={client}>
      <ScreenFlightForm {...props} />
    </QueryClientProvider>,
  );
  return { ...view, onSaved };
}

const errorOf = (id: string) => document.getElementById(`${id}-error`)?.textContent ?? null;
const save = () => fireEvent.click(screen.getByRole('button', { name: 'Save screening' }));

afterEach(() => cleanup());

describe('Screen a flight form', () => {
  it('Save with nothing filled in shows each problem beside its field and saves nothing', async () => {
    const { onSaved } = renderForm();
    save();
    await waitFor(() => expect(errorOf('airports-0')).toBe('Enter the departure airport.'));
    expect(errorOf('airports-1')).toBe('Enter the destination airport.');
    expect(errorOf('fuelBurn')).toBe('Enter the cruise fuel burn in kg.');
    expect(screen.getByLabelText('Cruise fuel burn (kg)').getAttribute('aria-invalid')).toBe('true');
    expect(onSaved).not.toHaveBeenCalled();
  });

  it('out-of-range values get the limits in words, in the units the planner typed', async () => {
    renderForm({ units: 'imperial' });
    fireEvent.change(screen.getByLabelText('Flight level'), { target: { value: '700' } });
    fireEvent.change(screen.getByLabelText('Cruise fuel burn (lb)'), { target: { value: '2,000,000' } });
    save();
    await waitFor(() => expect(errorOf('flightLevel')).toBe('The flight level must be between 0 and 660.'));
    expect(errorOf('fuelBurn')).toBe('The fuel burn must be between 2.3 and 1 102 311 lb.');
    fireEvent.change(screen.getByLabelText('Cruise fuel burn (lb)'), { target: { value: 'lots' } });
    await waitFor(() => expect(errorOf('fuelBurn')).toBe('The cruise fuel burn in lb must be a number.'));
    fireEvent.change(screen.getByLabelText('Cruise fuel burn (lb)'), { target: { value: '120 000' } });
    await waitFor(() => expect(errorOf('fuelBurn')).toBeNull());
  });

  it('step climbs: the first row starts at departure, rows are added and removed, order is checked', async () => {
    renderForm();
    fireEvent.click(screen.getByLabelText('Step climbs'));
    const rows = () => within(screen.getByTestId('step-rows')).getAllByTestId('step-row');
    expect(rows()).toHaveLength(2);
    expect(within(rows()[0]).getByText('departure (0 km)')).toBeTruthy();
    expect(within(rows()[0]).queryByRole('button', { name: /Remove/ })).toBeNull();
    fireEvent.change(screen.getByLabelText('Step 1 starts at (km)'), { target: { value: '3000' } });
    fireEvent.change(screen.getByLabelText('Step 1 flight level'), { target: { value: '390' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add a step climb' }));
    expect(rows()).toHaveLength(3);
    expect((screen.getByLabelText('Step 2 flight level') as HTMLInputElement).value).toBe('410');
    fireEvent.change(screen.getByLabelText('Step 2 starts at (km)'), { target: { value: '2000' } });
    save();
    await waitFor(() =>
      expect(errorOf('steps-2-from')).toBe('Each cruise step must start further along the route than the one before.'),
    );
    fireEvent.click(screen.getByRole('button', { name: 'Remove step 2' }));
    expect(rows()).toHaveLength(2);
    expect(screen.queryByLabelText('Step 2 flight level')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Remove step 1' }));
    expect(rows()).toHaveLength(1);
  });

  it('a pasted list of points fills the coordinate rows; a bad line is named and nothing changes', async () => {
    renderForm();
    fireEvent.click(screen.getByLabelText('Coordinates'));
    const paste = screen.getByLabelText('Or paste a list of points');
    fireEvent.change(paste, { target: { value: '51.47 -0.45\nnot a point\n61.17N 150.00W' } });
    fireEvent.click(screen.getByRole('button', { name: 'Use these points' }));
    expect(screen.getByTestId('paste-problems').textContent).toContain('Line 2');
    expect(screen.getAllByTestId('point-row')).toHaveLength(2);
    expect((screen.getByLabelText('Point 1 latitude') as HTMLInputElement).value).toBe('');
    fireEvent.change(paste, { target: { value: '51.47 -0.45\n64.13,-21.94\n61.17N 150.00W' } });
    fireEvent.click(screen.getByRole('button', { name: 'Use these points' }));
    expect(screen.queryByTestId('paste-problems')).toBeNull();
    expect(screen.getAllByTestId('point-row')).toHaveLength(3);
    expect((screen.getByLabelText('Point 2 latitude') as HTMLInputElement).value).toBe('64.13');
    expect((document.getElementById('points-2-lon') as HTMLInputElement).value).toBe('-150');
  });

  it('airport stops are added before the destination and removed again', () => {
    renderForm();
    expect(screen.getByLabelText('From')).toBeTruthy();
    expect(screen.getByLabelText('To')).toBeTruthy();
    expect(screen.queryByRole('button', { name: /Remove/ })).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Add a stop' }));
    expect(screen.getByLabelText('Stop 1')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Remove stop 1' }));
    expect(screen.queryByLabelText('Stop 1')).toBeNull();
  });

  it('a saved route fills the airports, or the coordinates when it has points that are not airports', () => {
    renderForm({
      routes: [
        {
          id: 1,
          name: 'North Atlantic via Keflavik',
          notes: 'winter track',
          waypoints: [{ airport: 'egll' }, { airport: 'BIKF' }, { airport: 'KSEA' }],
          coordinates: [null, null, null],
        },
        {
          id: 2,
          name: 'Polar points',
          notes: '',
          waypoints: [{ airport: 'EGLL' }, { lat: 78.2, lon: 15.6 }, { airport: 'PANC' }],
          coordinates: [
            { lat: 51.47, lon: -0.46 },
            { lat: 78.2, lon: 15.6 },
            { lat: 61.17, lon: -150 },
          ],
        },
      ],
    });
    fireEvent.change(screen.getByLabelText('Start from a saved route'), { target: { value: '1' } });
    expect((screen.getByLabelText('From') as HTMLInputElement).value).toBe('EGLL');
    expect((screen.getByLabelText('Stop 1') as HTMLInputElement).value).toBe('BIKF');
    expect((screen.getByLabelText('To') as HTMLInputElement).value).toBe('KSEA');
    expect(screen.getByText(/North Atlantic via Keflavik: 3 points\. winter track/)).toBeTruthy();
    fireEvent.change(screen.getByLabelText('Start from a saved route'), { target: { value: '2' } });
    expect(screen.getAllByTestId('point-row')).toHaveLength(3);
    expect((screen.getByLabelText('Point 2 latitude') as HTMLInputElement).value).toBe('78.2');
    expect((document.getElementById('points-2-lon') as HTMLInputElement).value).toBe('-150');
  });

  it('choosing an aircraft type fills its typical flight level unless the planner has set one', () => {
    renderForm({
      aircraft: [
        {
          code: 'A-1',
          name: 'First',
          engineName: null,
          engineCount: 2,
          typicalMach: 0.8,
          typicalFlightLevel: 350,
          directEiGPerKg: 12,
          emission: { eiNoxGPerKg: 12 },
        },
        {
          code: 'A-2',
          name: 'Second',
          engineName: null,
          engineCount: 2,
          typicalMach: 0.85,
          typicalFlightLevel: 450,
          directEiGPerKg: 10,
          emission: { eiNoxGPerKg: 10 },
        },
      ],
    });
    const fl = screen.getByLabelText('Flight level') as HTMLInputElement;
    expect(fl.value).toBe('350');
    fireEvent.change(screen.getByLabelText('Aircraft type'), { target: { value: 'A-2' } });
    expect(fl.value).toBe('450');
    fireEvent.change(fl, { target: { value: '410' } });
    fireEvent.change(screen.getByLabelText('Aircraft type'), { target: { value: 'A-1' } });
    expect(fl.value).toBe('410');
  });

  it('the advanced assumptions are folded away and show their defaults', () => {
    renderForm();
    const details = screen.getByTestId('assumption-fields') as HTMLDetailsElement;
    expect(details.open).toBe(false);
    expect((document.getElementById('assumptions-jO3NoonPerS-central') as HTMLInputElement).placeholder).toBe(
      '4.5 × 10⁻⁴',
    );
    expect((document.getElementById('assumptions-relativeHumidity') as HTMLInputElement).placeholder).toBe('60');
  });

  describe('server errors belong to the input they were computed from', () => {
    type Answer = { status: number; body: unknown } | 'hang';
    function stubServer(answer: (url: string, body: string) => Answer) {
      const calls: string[] = [];
      vi.stubGlobal('fetch', (url: string, init?: RequestInit) => {
        const body = String(init?.body ?? '');
        calls.push(`${url} ${body}`);
        if (url.startsWith('/api/v1/airports'))
          return Promise.resolve(new Response('[]', { status: 200, headers: { 'content-type': 'application/json' } }));
        const a = answer(url, body);
        if (a === 'hang') {
          return new Promise((_resolve, reject) =>
            init?.signal?.addEventListener('abort', () => reject(new DOMException('aborted', 'AbortError'))),
          );
        }
        return Promise.resolve(
          new Response(JSON.stringify(a.body), { status: a.status, headers: { 'content-type': 'application/json' } }),
        );
      });
      return calls;
    }
    const noLength = {
      status: 422,
      body: {
        error: {
          code: 'invalid_input',
          message: 'Check the highlighted fields.',
          fields: [{ path: 'route', message: 'The route has no length: give two different places.' }],
        },
      },
    };
    afterEach(() => vi.unstubAllGlobals());

    function fillSameAirportTwice() {
      fireEvent.change(screen.getByLabelText('From'), { target: { value: 'EGLL' } });
      fireEvent.change(screen.getByLabelText('To'), { target: { value: 'EGLL' } });
      fireEvent.change(screen.getByLabelText('Cruise fuel burn (kg)'), { target: { value: '60000' } });
      fireEvent.change(screen.getByLabelText('Aircraft type'), { target: { value: 'T-LR' } });
    }

    it("the preview's field error goes as soon as the route changes, before any new answer", async () => {
      const calls = stubServer((_url, body) => (body.includes('"EFHK"') ? 'hang' : noLength));
      renderForm({ previewDelayMs: 0 });
      fillSameAirportTwice();
      await waitFor(() => expect(screen.getByText('The route has no length: give two different places.')).toBeTruthy());
      fireEvent.change(screen.getByLabelText('To'), { target: { value: 'EFHK' } });
      await waitFor(() => expect(screen.queryByText('The route has no length: give two different places.')).toBeNull());
      expect(calls.some((c) => c.includes('/screenings/preview') && c.includes('"EFHK"'))).toBe(true);
    });

    it("a save's field error and its summary go when the input changes", async () => {
      stubServer((url) => (url.endsWith('/screenings') ? noLength : 'hang'));
      renderForm({ previewDelayMs: 0 });
      fillSameAirportTwice();
      save();
      await waitFor(() =>
        expect(screen.getByText('Some fields need attention: see the messages beside them.')).toBeTruthy(),
      );
      expect(screen.getByText('The route has no length: give two different places.')).toBeTruthy();
      fireEvent.change(screen.getByLabelText('From'), { target: { value: 'EFHK' } });
      await waitFor(() => expect(screen.queryByText('The route has no length: give two different places.')).toBeNull());
      expect(screen.queryByText('Some fields need attention: see the messages beside them.')).toBeNull();
    });

    it('an unchanged input keeps its server error', async () => {
      stubServer(() => noLength);
      renderForm({ previewDelayMs: 0 });
      fillSameAirportTwice();
      await waitFor(() => expect(screen.getByText('The route has no length: give two different places.')).toBeTruthy());
      fireEvent.change(screen.getByLabelText('To'), { target: { value: 'EGLL' } });
      await new Promise((r) => setTimeout(r, 50));
      expect(screen.getByText('The route has no length: give two different places.')).toBeTruthy();
    });
  });
});
