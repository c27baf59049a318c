'use client';

import { useRouter } from 'next/navigation';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { reportCreateSchema } from '@/lib/validation/reports';
import type { ActionState } from '@/lib/errors';
import { Button } from '@/components/ui/button';
import { Field, TextInput } from '@/components/ui/field';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';

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
  const { form, errors, pending, message, onSubmit } = useActionForm<Input, Output, { id: number }>({
    resolver: zodResolver(reportCreateSchema),
    defaultValues: { name: '', from: defaults.from, to: defaults.to, fleetIds: defaults.fleetIds.map(String) },
    fields: ['name', 'from', 'to', 'fleetIds'],
    action: async (values) => {
      const state = await action(slug, values);
      // A fleet deleted since the page loaded comes back on `fleetIds.<n>`, which no field shows.
      const staleFleet =
        state && !state.ok && !state.error.message && state.error.fields?.some((f) => f.path.startsWith('fleetIds.'));
      return staleFleet
        ? {
            ...state,
            error: {
              ...state.error,
              message: 'One of the chosen fleets no longer exists. Reload the page and choose again.',
            },
          }
        : state;
    },
    onSuccess: (state) => {
      if (state.data) router.push(`/w/${slug}/reports/${state.data.id}`);
    },
  });
  const fleetError =
    errors.fleetIds?.message ?? (Array.isArray(errors.fleetIds) ? 'Choose fleets from the list.' : undefined);
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Build a fleet report">
      <FormNotice message={message} />
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
        <Button type="submit" disabled={pending}>
          {pending ? 'Building the report…' : 'Build report'}
        </Button>
        <span className="text-xs text-ink-faint">The PDF uses your unit preference; the CSV is in kg and km.</span>
      </div>
    </form>
  );
}
