'use client';

import { useState } from 'react';
import { Controller, type UseFormReturn } from 'react-hook-form';
import { useQuery } from '@tanstack/react-query';
import type { FlightPlanItem, FlightPlanUsed } from '@/lib/screening';
import type { ScreenFormValues } from '@/components/screening/screen-form-adapter';
import { Field, TextArea, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { AirportCombobox } from './airport-combobox';

const STATUS: Record<FlightPlanItem['status'], { label: string; className: string }> = {
  read: { label: 'read', className: 'bg-paper-raised text-ink' },
  'looked-up': { label: 'looked up', className: 'bg-accent/10 text-accent' },
  'not-found': { label: 'not found', className: 'bg-danger-soft text-danger' },
  ignored: { label: 'ignored', className: 'bg-paper-raised text-ink-faint' },
};

/** The point part of an item: `63N030W` of `63N030W/N0480F370` or of `C/63N030W/M082F290F350`. */
function pointOf(item: string): string {
  const parts = item.split('/');
  return item.startsWith('C/') ? (parts[1] ?? item) : parts[0];
}

/** The last word being typed, when it could be the start of a fix or airway name. */
function typedName(text: string): string | null {
  const m = /([A-Za-z][A-Za-z0-9]{1,11})$/.exec(text);
  return m ? m[1].toUpperCase() : null;
}

async function fetchNames(slug: string, q: string, signal: AbortSignal): Promise<string[]> {
  const get = async (what: 'fixes' | 'airways') => {
    const res = await fetch(`/api/v1/workspaces/${slug}/${what}?q=${encodeURIComponent(q)}&limit=8`, {
      signal,
      headers: { accept: 'application/json' },
    });
    if (!res.ok) return [];
    return ((await res.json()) as { items: { name: string }[] }).items.map((i) => i.name);
  };
  const [fixes, airways] = await Promise.all([get('fixes'), get('airways')]);
  return [...new Set([...fixes, ...airways])].filter((n) => n !== q).slice(0, 8);
}

/**
 * The "Flight plan" way of giving the route: the item-15 text between two aerodromes, the names of
 * the workspace's fixes and airways offered as the planner types, each item of the last preview
 * marked read, looked up, not found (with the reason) or ignored, and coordinates that can be named
 * into the fix library in one click.
 */
export function FlightPlanEntry({
  slug,
  form,
  errorAt,
  understood,
}: {
  slug: string;
  form: UseFormReturn<ScreenFormValues>;
  errorAt: (path: string) => string | undefined;
  understood: FlightPlanUsed | undefined;
}) {
  const { control, register, setValue, watch } = form;
  const text = watch('flightPlan.text');
  const typing = typedName(text ?? '');
  const names = useQuery({
    queryKey: ['route-library-names', slug, typing],
    enabled: typing !== null,
    staleTime: 60_000,
    queryFn: ({ signal }) => fetchNames(slug, typing ?? '', signal),
  });
  const suggestions = typing !== null ? (names.data ?? []) : [];
  const reasons = new Map((understood?.unresolved ?? []).map((u) => [u.position, u.reason]));
  const coordinates = (understood?.items ?? []).filter((i) => i.kind === 'coordinates');
  const [pointNames, setPointNames] = useState<Record<string, string>>({});
  const [saveNote, setSaveNote] = useState<{ ok: boolean; text: string }>();

  const addToLibrary = async () => {
    setSaveNote(undefined);
    const fixes = (understood?.waypoints ?? [])
      .filter((w) => w.name !== undefined && (pointNames[w.name] ?? '').trim() !== '')
      .map((w) => ({ name: (pointNames[w.name ?? ''] ?? '').trim().toUpperCase(), lat: w.lat, lon: w.lon }));
    if (fixes.length === 0) {
      setSaveNote({ ok: false, text: 'Type a name beside the coordinates you want to keep.' });
      return;
    }
    const res = await fetch(`/api/v1/workspaces/${slug}/fixes`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', accept: 'application/json' },
      body: JSON.stringify({ fixes }),
    }).catch(() => null);
    if (res?.ok) {
      setSaveNote({
        ok: true,
        text: `${fixes.length} point${fixes.length === 1 ? '' : 's'} added to the fix library.`,
      });
      setPointNames({});
      return;
    }
    const body = (await res?.json().catch(() => null)) as {
      error?: { message?: string; fields?: { message: string }[] };
    } | null;
    setSaveNote({
      ok: false,
      text: body?.error?.fields?.[0]?.message ?? body?.error?.message ?? 'The points could not be added.',
    });
  };

  return (
    <div className="space-y-3" data-testid="flight-plan-entry">
      <div className="grid gap-3 sm:grid-cols-2">
        {(['from', 'to'] as const).map((end) => (
          <Controller
            key={end}
            control={control}
            name={`flightPlan.${end}`}
            render={({ field }) => (
              <AirportCombobox
                id={`flight-plan-${end}`}
                label={end === 'from' ? 'Departure' : 'Destination'}
                value={field.value}
                onChange={field.onChange}
                onBlur={field.onBlur}
                name={field.name}
                placeholder={end === 'from' ? 'EFHK' : 'PANC'}
                error={errorAt(`flightPlan.${end}`)}
              />
            )}
          />
        ))}
      </div>
      <Field
        id="flight-plan-text"
        label="Route (item 15)"
        error={errorAt('flightPlan.text')}
        hint="Speed and level first, then points, airways and DCT: N0480F350 DCT 62N020W 63N030W/N0480F370 DCT. Its levels replace the cruise below."
      >
        <TextArea
          id="flight-plan-text"
          rows={4}
          className="font-mono uppercase"
          spellCheck={false}
          autoComplete="off"
          invalid={!!errorAt('flightPlan.text')}
          {...register('flightPlan.text')}
        />
      </Field>
      {suggestions.length ? (
        <div className="flex flex-wrap items-center gap-2 text-xs" aria-label="Names in this workspace's library">
          <span className="text-ink-faint">From the library:</span>
          {suggestions.map((n) => (
            <button
              key={n}
              type="button"
              className="rounded border border-line-strong px-2 py-0.5 font-mono hover:bg-paper-raised"
              onClick={() =>
                setValue(
                  'flightPlan.text',
                  `${(text ?? '').slice(0, (text ?? '').length - (typing?.length ?? 0))}${n} `,
                  { shouldDirty: true },
                )
              }
            >
              {n}
            </button>
          ))}
        </div>
      ) : null}
      {understood ? (
        <div className="space-y-2">
          <ul
            className="flex flex-wrap gap-1.5 text-xs"
            aria-label="How each item was understood"
            data-testid="flight-plan-items"
          >
            {understood.items.map((it) => (
              <li
                key={`${it.position}-${it.item}`}
                className={`rounded px-1.5 py-0.5 font-mono ${STATUS[it.status].className}`}
                title={reasons.get(it.position) ?? it.detail}
              >
                {it.item} <span className="font-sans">· {STATUS[it.status].label}</span>
              </li>
            ))}
          </ul>
          {understood.unresolved.length ? (
            <ul role="alert" className="list-disc pl-5 text-xs text-danger" data-testid="flight-plan-unresolved">
              {understood.unresolved.map((u) => (
                <li key={`${u.position}-${u.item}`}>
                  <span className="font-mono">{u.item || '(empty)'}</span>
                  {u.position !== null ? ` (character ${u.position + 1})` : ''}: {u.reason}
                </li>
              ))}
            </ul>
          ) : null}
          {understood.notes.length ? (
            <details className="text-xs text-ink-soft">
              <summary className="cursor-pointer">
                {understood.notes.length} note{understood.notes.length === 1 ? '' : 's'} on how the route was read
              </summary>
              <ul className="mt-1 list-disc pl-5">
                {understood.notes.map((n, i) => (
                  <li key={i}>{n}</li>
                ))}
              </ul>
            </details>
          ) : null}
          {coordinates.length ? (
            <details className="rounded-md border border-dashed border-line-strong p-3 text-sm">
              <summary className="cursor-pointer">Name coordinates for the fix library</summary>
              <div className="mt-2 space-y-2">
                {coordinates.map((c) => (
                  <Field key={`${c.position}-${c.item}`} id={`name-${c.position}`} label={pointOf(c.item)}>
                    <TextInput
                      id={`name-${c.position}`}
                      placeholder="Name, such as QXBEL"
                      value={pointNames[pointOf(c.item)] ?? ''}
                      onChange={(e) => setPointNames((p) => ({ ...p, [pointOf(c.item)]: e.target.value }))}
                    />
                  </Field>
                ))}
                <Button variant="secondary" onClick={addToLibrary}>
                  Add these points to the fix library
                </Button>
                {saveNote ? (
                  <Notice tone={saveNote.ok ? 'success' : 'danger'} role={saveNote.ok ? 'status' : 'alert'}>
                    {saveNote.text}
                  </Notice>
                ) : null}
              </div>
            </details>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
