// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { AppRouterContext } from 'next/dist/shared/lib/app-router-context.shared-runtime';
import type { AppRouterInstance } from 'next/dist/shared/lib/app-router-context.shared-runtime';
import { TargetsForm } from '@/components/periods/targets-form';

afterEach(cleanup);

const router = { refresh: () => undefined } as unknown as AppRouterInstance;

describe('period targets form', () => {
  it("shows each target's unit beside its value and in the value's name, following the chosen measure", () => {
    render(
      <AppRouterContext.Provider value={router}>
        <TargetsForm
          slug="skarn-polar"
          period="2026-Q4"
          fleets={[{ id: 1, name: 'Polar long-haul A' }]}
          initial={[
            { fleetId: null, metric: 'noxAboveT', target: 107 },
            { fleetId: 1, metric: 'shareAbovePct', target: 94.9 },
          ]}
          action={async () => ({ ok: true, data: null })}
        />
      </AppRouterContext.Provider>,
    );
    expect(screen.getAllByTestId('target-unit').map((u) => u.textContent)).toEqual(['t', '%']);
    expect((screen.getByLabelText('Value of target 1 (t)') as HTMLInputElement).value).toBe('107');
    expect((screen.getByLabelText('Value of target 2 (%)') as HTMLInputElement).value).toBe('94.9');
    fireEvent.change(screen.getByLabelText('Measure of target 2'), { target: { value: 'noxAbovePer1000KmKg' } });
    expect(screen.getAllByTestId('target-unit').map((u) => u.textContent)).toEqual(['t', 'kg']);
    expect(screen.getByLabelText('Value of target 2 (kg)')).toBeTruthy();
  });
});
