'use client';

import { useRouter } from 'next/navigation';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { routeFormSchema, ROUTE_NOTES_MAX } from '@/lib/validation/library';
import type { ActionState } from '@/lib/errors';
import { Field, TextArea, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';

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
  const isNew = !initial;
  const { form, errors, pending, message, onSubmit } = useActionForm<
    Values,
    z.output<typeof routeFormSchema>,
    { id: number }
  >({
    resolver: zodResolver(routeFormSchema),
    defaultValues: initial ?? { name: '', waypointsText: '', notes: '' },
    fields: ['name', 'waypointsText', 'notes'],
    // The action parses the raw form values itself (the waypoints text is resolved on the server).
    action: (): Promise<ActionState<{ id: number }>> => action(form.getValues()),
    onSuccess: (state) => {
      if (isNew && state.data) router.push(`${detailBase}/${state.data.id}`);
      else return state.message ?? 'Saved.';
    },
  });
  const idp = isNew ? 'new-route' : 'route';
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
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
        hint={`Optional, up to ${ROUTE_NOTES_MAX} characters: when this route is flown, why it matters.`}
      >
        <TextArea id={`${idp}-notes`} rows={3} invalid={!!errors.notes} {...form.register('notes')} />
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? 'Saving…' : isNew ? 'Save route' : 'Save changes'}
      </Button>
    </form>
  );
}
