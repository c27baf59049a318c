'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { routeFormSchema, ROUTE_NOTES_MAX } from '@/lib/validation/library';
import type { ActionState } from '@/lib/errors';
import { Field, TextArea, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';

type Values = z.input<typeof routeFormSchema>;

/**
 * The saved-route form: a name, the waypoints typed one per line, notes. `action` is the bound
 * server action; a new route goes to its own page once saved.
 */
export function RouteForm({
  action,
  initial,
  detailBase,
}: {
  action: (values: Values) => Promise<ActionState<{ id: number }>>;
  initial?: Values;
  detailBase: string;
}) {
  const router = useRouter();
  const [message, setMessage] = useState<{ tone: 'success' | 'danger'; text: string }>();
  const form = useForm<Values, unknown, z.output<typeof routeFormSchema>>({
    resolver: zodResolver(routeFormSchema),
    defaultValues: initial ?? { name: '', waypointsText: '', notes: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const isNew = !initial;
  const onSubmit = form.handleSubmit(async () => {
    setMessage(undefined);
    const state = await action(form.getValues());
    if (state?.ok) {
      if (isNew && state.data) router.push(`${detailBase}/${state.data.id}`);
      else setMessage({ tone: 'success', text: state.message ?? 'Saved.' });
      return;
    }
    const text = applyServerErrors(state, form.setError, ['name', 'waypointsText', 'notes']);
    if (text) setMessage({ tone: 'danger', text });
  });
  const idp = isNew ? 'new-route' : 'route';
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      <Field
        id={`${idp}-name`}
        label="Route name"
        error={errors.name?.message}
        hint="Unique in this workspace, such as “LHR–SEA polar, winter”."
      >
        <TextInput id={`${idp}-name`} autoComplete="off" invalid={!!errors.name} {...form.register('name')} />
      </Field>
      <Field
        id={`${idp}-waypoints`}
        label="Waypoints, in order"
        error={errors.waypointsText?.message}
        hint="One per line: an airport code (EGLL or LHR), or latitude, longitude in degrees (north and east positive), such as 80, -60. Several codes may share a line."
      >
        <TextArea
          id={`${idp}-waypoints`}
          rows={6}
          spellCheck={false}
          className="font-mono"
          invalid={!!errors.waypointsText}
          {...form.register('waypointsText')}
        />
      </Field>
      <Field
        id={`${idp}-notes`}
        label="Notes"
        error={errors.notes?.message}
        hint={`Optional, up to ${ROUTE_NOTES_MAX} characters: when this track is flown, why it matters.`}
      >
        <TextArea id={`${idp}-notes`} rows={3} invalid={!!errors.notes} {...form.register('notes')} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Saving…' : isNew ? 'Save route' : 'Save changes'}
      </Button>
    </form>
  );
}
