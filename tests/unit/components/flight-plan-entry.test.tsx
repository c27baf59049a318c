// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { FlightPlanEntry } from '@/components/screening/flight-plan-entry';
import { expandFlightPlanInput, type FlightPlanUsed } from '@/lib/screening';
import { emptyScreenForm, type ScreenFormValues } from '@/components/screening/screen-form-adapter';

// Invented library names for the test.
const LIBRARY = { fixes: [{ name: 'QXORV', lat: 63, lon: -25 }], airways: [] };

/** A stand-in for the API's fix and airway type-ahead and for adding fixes. */
function fakeApi() {
  const posted: unknown[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      if (url.includes('/fixes?q='))
        return Response.json({
          items: LIBRARY.fixes.filter((f) => f.name.startsWith(new URL(url, 'http://x').searchParams.get('q') ?? '')),
        });
      if (url.includes('/airways?q=')) return Response.json({ items: [] });
      if (url.endsWith('/fixes') && init?.method === 'POST') {
        posted.push(JSON.parse(String(init.body)));
        return Response.json({ added: 1, updated: 0 }, { status: 201 });
      }
      return Response.json({ items: [] });
    }),
  );
  return { posted };
}

/** The entry inside a form of its own; what was understood comes from the real engine on the text typed. */
function Harness() {
  const form = useForm<ScreenFormValues>({ defaultValues: emptyScreenForm('2026-11-20') });
  const fp = form.watch('flightPlan');
  let understood: FlightPlanUsed | undefined;
  try {
    understood =
      expandFlightPlanInput(
        {
          route: { flightPlan: { text: fp.text || 'DCT', from: fp.from || 'EFHK', to: fp.to || 'PANC' } },
          cruise: { flightLevel: 350 },
          fuelBurnKg: 1000,
          emission: { eiNoxGPerKg: 14 },
        },
        LIBRARY,
      ).flightPlan ?? undefined;
  } catch {
    understood = undefined;
  }
  return <FlightPlanEntry slug="test-air" form={form} errorAt={() => undefined} understood={understood} />;
}

function renderEntry() {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <Harness />
    </QueryClientProvider>,
  );
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('Flight plan route entry', () => {
  it('marks each item read, looked up or not found with its reason, offers library names, and adds named coordinates to the fix library', async () => {
    const api = fakeApi();
    renderEntry();
    fireEvent.change(screen.getByLabelText('Departure'), { target: { value: 'EFHK' } });
    fireEvent.change(screen.getByLabelText('Destination'), { target: { value: 'PANC' } });
    const text = screen.getByLabelText('Route (item 15)');
    fireEvent.change(text, { target: { value: 'N0480F350 DCT 62N020W QXO' } });
    const suggestion = await screen.findByRole('button', { name: 'QXORV' });
    fireEvent.click(suggestion);
    expect((text as HTMLTextAreaElement).value).toBe('N0480F350 DCT 62N020W QXORV ');
    fireEvent.change(text, { target: { value: 'N0480F350 DCT 62N020W QXORV/N0480F370 NOWHR DCT' } });
    const items = await screen.findByTestId('flight-plan-items');
    await waitFor(() => expect(within(items).getByText('NOWHR', { exact: false })).toBeTruthy());
    expect(within(items).getByText('62N020W', { exact: false }).textContent).toContain('read');
    expect(within(items).getByText('QXORV/N0480F370', { exact: false }).textContent).toContain('looked up');
    expect(within(items).getByText('NOWHR', { exact: false }).textContent).toContain('not found');
    expect(screen.getByTestId('flight-plan-unresolved').textContent).toContain(
      'NOWHR (character 39): NOWHR is not in the fix library.',
    );
    fireEvent.click(screen.getByText('Name coordinates for the fix library'));
    fireEvent.change(screen.getByLabelText('62N020W'), { target: { value: 'qxtmo' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add these points to the fix library' }));
    await screen.findByText('1 point added to the fix library.');
    expect(api.posted).toEqual([{ fixes: [{ name: 'QXTMO', lat: 62, lon: -20 }] }]);
  });
});
