// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { AppRouterContext } from 'next/dist/shared/lib/app-router-context.shared-runtime';
import type { AppRouterInstance } from 'next/dist/shared/lib/app-router-context.shared-runtime';
import { SoundingUploadForm } from '@/components/library/sounding-upload-form';
import { AircraftTypeForm } from '@/components/library/aircraft-type-form';
import { RouteLibraryUploadForm } from '@/components/library/route-library-forms';

afterEach(cleanup);

const router = { refresh: () => undefined, push: () => undefined } as unknown as AppRouterInstance;
const inRouter = (ui: React.ReactNode) =>
  render(<AppRouterContext.Provider value={router}>{ui}</AppRouterContext.Provider>);

/** The ids the controls' aria-describedby names, and whether each of them is in the page. */
const describedBy = (el: HTMLElement) =>
  (el.getAttribute('aria-describedby') ?? '').split(' ').map((id) => [id, document.getElementById(id) !== null]);

describe('library forms built from the shared field parts', () => {
  it('labels every sounding field, points each at its hint, and names a missing file beside the file input', async () => {
    inRouter(<SoundingUploadForm slug="w" templateHref="data:text/csv,x" />);
    const name = screen.getByLabelText('Name');
    expect(name.getAttribute('name')).toBe('name');
    expect(name.getAttribute('autocomplete')).toBe('off');
    expect(describedBy(name)).toEqual([['sounding-name-hint', true]]);
    const observed = screen.getByLabelText('Observation time (UTC)');
    expect([observed.id, observed.getAttribute('type'), observed.getAttribute('name')]).toEqual([
      'sounding-observed',
      'datetime-local',
      'observedAt',
    ]);
    expect(screen.getByLabelText('Station').id).toBe('sounding-station');
    const file = screen.getByLabelText('Levels CSV');
    expect(describedBy(file)).toEqual([['sounding-file-hint', true]]);
    expect(file.getAttribute('aria-invalid')).toBeNull();

    fireEvent.change(name, { target: { value: 'Test sounding' } });
    fireEvent.click(screen.getByRole('button', { name: 'Upload sounding' }));
    await waitFor(() => expect(file.getAttribute('aria-invalid')).toBe('true'));
    expect(describedBy(file)).toEqual([['sounding-file-error', true]]);
    expect(document.getElementById('sounding-file-error')?.textContent).toBe('Choose the CSV file with the levels.');
    expect(document.getElementById('sounding-file-hint')).toBeNull();
  });

  it('keeps the fix upload input named by kind, with its hint until a submit without a file', async () => {
    inRouter(<RouteLibraryUploadForm slug="w" kind="fixes" templateHref="data:text/csv,x" />);
    const file = screen.getByLabelText('Fixes CSV');
    expect(file.id).toBe('fixes-file');
    expect(describedBy(file)).toEqual([['fixes-file-hint', true]]);
    fireEvent.click(screen.getByRole('button', { name: 'Upload fixes' }));
    await waitFor(() => expect(screen.getByRole('alert').textContent).toBe('Choose the CSV file.'));
    expect(describedBy(file)).toEqual([['fixes-file-error', true]]);
  });

  it('marks the aircraft type number inputs invalid with the message beside them after a bad value', async () => {
    inRouter(
      <AircraftTypeForm
        action={async () => ({ ok: true, data: { id: 1 } })}
        engines={[]}
        fleets={[]}
        fleetsHref="/w/x/fleets"
      />,
    );
    const count = screen.getByLabelText('Engines');
    expect([count.id, count.getAttribute('name'), count.getAttribute('inputmode')]).toEqual([
      'new-type-count',
      'engineCount',
      'numeric',
    ]);
    expect(screen.getByLabelText('Typical cruise Mach').getAttribute('inputmode')).toBe('decimal');
    expect(screen.getByLabelText('Typical cruise flight level').id).toBe('new-type-fl');
    expect(screen.getByLabelText('Type code').className).toContain('font-mono uppercase');
    fireEvent.click(screen.getByLabelText('Direct cruise EI NOx'));
    const direct = screen.getByLabelText('Cruise EI NOx (g/kg)');
    expect([direct.id, direct.getAttribute('name')]).toEqual(['new-type-direct', 'directEiGPerKg']);

    fireEvent.change(count, { target: { value: '40' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add aircraft type' }));
    await waitFor(() => expect(count.getAttribute('aria-invalid')).toBe('true'));
    expect(describedBy(count)).toEqual([['new-type-count-error', true]]);
  });
});
