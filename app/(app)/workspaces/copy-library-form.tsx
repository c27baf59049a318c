'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { Field, SelectInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { copyLibraryAction } from './actions';

/** Copy engines, aircraft types and fleet definitions between two workspaces the user owns. */
export function CopyLibraryForm({ workspaces }: { workspaces: { slug: string; name: string }[] }) {
  const router = useRouter();
  const [from, setFrom] = useState(workspaces[0]?.slug ?? '');
  const [to, setTo] = useState(workspaces[1]?.slug ?? '');
  const [include, setInclude] = useState({ engines: true, aircraftTypes: true, fleets: true });
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [pending, start] = useTransition();
  const box = (key: keyof typeof include, label: string) => (
    <label className="flex items-center gap-2 text-sm text-ink">
      <input
        type="checkbox"
        className="accent-accent"
        checked={include[key]}
        onChange={(e) => setInclude({ ...include, [key]: e.target.checked })}
      />
      {label}
    </label>
  );
  return (
    <form
      noValidate
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        setMessage(undefined);
        setErrors({});
        start(async () => {
          const state = await copyLibraryAction({ from, to, ...include });
          if (state?.ok) {
            setMessage({ ok: true, text: state.message ?? 'Copied.' });
            router.refresh();
          } else if (state) {
            setErrors(Object.fromEntries((state.error.fields ?? []).map((f) => [f.path, f.message])));
            setMessage({ ok: false, text: state.error.message });
          }
        });
      }}
    >
      {message ? (
        <Notice tone={message.ok ? 'success' : 'danger'} role={message.ok ? 'status' : 'alert'}>
          {message.text}
        </Notice>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="copy-from" label="From" error={errors.from}>
          <SelectInput id="copy-from" value={from} onChange={(e) => setFrom(e.target.value)}>
            {workspaces.map((w) => (
              <option key={w.slug} value={w.slug}>
                {w.name}
              </option>
            ))}
          </SelectInput>
        </Field>
        <Field id="copy-to" label="To" error={errors.to}>
          <SelectInput id="copy-to" value={to} onChange={(e) => setTo(e.target.value)}>
            {workspaces.map((w) => (
              <option key={w.slug} value={w.slug}>
                {w.name}
              </option>
            ))}
          </SelectInput>
        </Field>
      </div>
      <fieldset className="space-y-1">
        <legend className="mb-1 text-sm font-medium text-ink">Copy</legend>
        {box('engines', 'Engines')}
        {box('aircraftTypes', 'Aircraft types (with the engines and default fleets they use)')}
        {box('fleets', 'Fleet definitions (names and descriptions; no flights)')}
        {errors.engines ? <p className="text-sm text-danger">{errors.engines}</p> : null}
      </fieldset>
      <p className="text-xs text-ink-soft">
        Anything the target already has with the same name (engines, fleets) or code (aircraft types) is kept as it is.
        Flights, screenings and reports are never copied.
      </p>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? 'Copying…' : 'Copy library'}
      </Button>
    </form>
  );
}
