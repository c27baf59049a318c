'use client';

import { useRouter } from 'next/navigation';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { libraryCopySchema, type LibraryCopyInput } from '@/lib/validation/library-copy';
import { Field, SelectInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';
import { copyLibraryAction } from './actions';

const BOXES = [
  ['engines', 'Engines'],
  ['aircraftTypes', 'Aircraft types (with the engines and default fleets they use)'],
  ['fleets', 'Fleet definitions (names and descriptions; no flights)'],
] as const;

/** Copy engines, aircraft types and fleet definitions between two workspaces the user owns. */
export function CopyLibraryForm({ workspaces }: { workspaces: { slug: string; name: string }[] }) {
  const router = useRouter();
  const { form, errors, pending, message, onSubmit } = useActionForm<
    z.input<typeof libraryCopySchema>,
    LibraryCopyInput,
    unknown
  >({
    resolver: zodResolver(libraryCopySchema),
    defaultValues: {
      from: workspaces[0]?.slug ?? '',
      to: workspaces[1]?.slug ?? '',
      engines: true,
      aircraftTypes: true,
      fleets: true,
    },
    fields: ['from', 'to', 'engines'],
    action: copyLibraryAction,
    onSuccess: (state) => {
      router.refresh();
      return state.message ?? 'Copied.';
    },
  });
  return (
    <form noValidate className="space-y-4" onSubmit={onSubmit}>
      <FormNotice message={message} />
      <div className="grid gap-4 sm:grid-cols-2">
        {(['from', 'to'] as const).map((key) => (
          <Field key={key} id={`copy-${key}`} label={key === 'from' ? 'From' : 'To'} error={errors[key]?.message}>
            <SelectInput id={`copy-${key}`} invalid={!!errors[key]} {...form.register(key)}>
              {workspaces.map((w) => (
                <option key={w.slug} value={w.slug}>
                  {w.name}
                </option>
              ))}
            </SelectInput>
          </Field>
        ))}
      </div>
      <fieldset className="space-y-1">
        <legend className="mb-1 text-sm font-medium text-ink">Copy</legend>
        {BOXES.map(([key, label]) => (
          <label key={key} className="flex items-center gap-2 text-sm text-ink">
            <input type="checkbox" className="accent-accent" {...form.register(key)} />
            {label}
          </label>
        ))}
        {errors.engines ? <p className="text-sm text-danger">{errors.engines.message}</p> : null}
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
