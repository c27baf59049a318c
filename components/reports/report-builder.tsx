'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { reportCreateSchema } from '@/lib/validation/reports';
import type { ActionState } from '@/lib/errors';
import { Button } from '@/components/ui/button';
import { Field, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';

type Input = z.input<typeof reportCreateSchema>;
type Output = z.output<typeof reportCreateSchema>;

interface Props {
  slug: string;
  fleets: { id: number; name: string; screenedFlights: number }[];
  defaults: { from: string; to: string; fleetIds: number[] };
  action: (slug: string, raw: unknown) => Promise<ActionState<{ id: number }>>;
}

/** Period, fleets and a name; builds and stores the PDF and CSV, then opens the report. */
export function ReportBuilder({ slug, fleets, defaults, action }: Props) {
  const router = useRouter();
  const [message, setMessage] = useState<string>();
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(reportCreateSchema),
    defaultValues: { name: '', from: defaults.from, to: defaults.to, fleetIds: defaults.fleetIds.map(String) },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await action(slug, values);
    if (state?.ok && state.data) {
      router.push(`/w/${slug}/reports/${state.data.id}`);
      return;
    }
    const text = applyServerErrors(state, form.setError, ['name', 'from', 'to', 'fleetIds']);
    if (text) setMessage(text);
    else if (state && !state.ok && state.error.fields?.some((f) => f.path.startsWith('fleetIds.')))
      setMessage('One of the chosen fleets no longer exists. Reload the page and choose again.');
  });
  const fleetError =
    errors.fleetIds?.message ?? (Array.isArray(errors.fleetIds) ? 'Choose fleets from the list.' : undefined);
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Build a fleet report">
      {message ? (
        <Notice tone="danger" role="alert">
          {message}
        </Notice>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="report-from" label="Period from" error={errors.from?.message}>
          <TextInput id="report-from" type="date" invalid={!!errors.from} {...form.register('from')} />
        </Field>
        <Field id="report-to" label="Period to" error={errors.to?.message}>
          <TextInput id="report-to" type="date" invalid={!!errors.to} {...form.register('to')} />
        </Field>
        <Field
          id="report-name"
          label="Name (optional)"
          error={errors.name?.message}
          hint="Defaults to “Fleet report <from> to <to>”"
        >
          <TextInput id="report-name" invalid={!!errors.name} {...form.register('name')} />
        </Field>
      </div>
      <fieldset aria-describedby={fleetError ? 'report-fleets-error' : undefined}>
        <legend className="text-sm font-medium text-ink">Fleets in the report</legend>
        <div className="mt-1 flex flex-wrap gap-x-5 gap-y-1.5">
          {fleets.map((f) => (
            <label key={f.id} className="inline-flex items-center gap-1.5 text-sm text-ink">
              <input type="checkbox" value={String(f.id)} className="accent-accent" {...form.register('fleetIds')} />
              {f.name}
              <span className="text-xs text-ink-faint">({f.screenedFlights} screened)</span>
            </label>
          ))}
        </div>
        {fleetError ? (
          <p id="report-fleets-error" role="alert" className="mt-1 text-xs font-medium text-danger">
            {fleetError}
          </p>
        ) : null}
      </fieldset>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Building the report…' : 'Build report'}
        </Button>
        <span className="text-xs text-ink-faint">The PDF uses your unit preference; the CSV is in kg and km.</span>
      </div>
    </form>
  );
}
