'use client';

import { useState, useTransition } from 'react';
import { zodResolver } from '@hookform/resolvers/zod';
import { fleetCreateSchema, type FleetCreate } from '@/lib/validation/fleets';
import type { ActionState } from '@/lib/errors';
import { Button } from '@/components/ui/button';
import { Field, TextInput } from '@/components/ui/field';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';
import { formatNumber } from '@/lib/format';

export interface FleetItem {
  id: number;
  name: string;
  description: string;
  aircraftTypes: { id: number; code: string }[];
  screenedFlights: number;
}

export interface AircraftTypeItem {
  id: number;
  code: string;
  name: string;
  defaultFleetId: number | null;
}

type Action = (slug: string, raw: unknown) => Promise<ActionState<unknown>>;

interface Actions {
  create: Action;
  update: Action;
  remove: Action;
  assign: Action;
}

export function CreateFleetForm({ slug, action }: { slug: string; action: Action }) {
  const { form, errors, pending, message, onSubmit } = useActionForm<FleetCreate, FleetCreate, unknown>({
    resolver: zodResolver(fleetCreateSchema),
    defaultValues: { name: '', description: '' },
    fields: ['name', 'description'],
    action: (values) => action(slug, values),
    onSuccess: (state) => {
      form.reset({ name: '', description: '' });
      return state.message ?? 'Fleet created.';
    },
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="New fleet">
      <FormNotice message={message} />
      <Field id="fleet-name" label="Fleet name" error={errors.name?.message}>
        <TextInput
          id="fleet-name"
          invalid={!!errors.name}
          placeholder="e.g. Long-haul twins"
          {...form.register('name')}
        />
      </Field>
      <Field id="fleet-description" label="Description (optional)" error={errors.description?.message}>
        <TextInput id="fleet-description" invalid={!!errors.description} {...form.register('description')} />
      </Field>
      <Button type="submit" disabled={pending}>
        Create fleet
      </Button>
    </form>
  );
}

function FleetRow({
  slug,
  fleet,
  actions,
  canWrite,
}: {
  slug: string;
  fleet: FleetItem;
  actions: Actions;
  canWrite: boolean;
}) {
  const [editing, setEditing] = useState(false);
  const [pending, start] = useTransition();
  const [error, setError] = useState<string>();
  const {
    form,
    errors,
    pending: saving,
    message,
    setMessage,
    onSubmit: onSave,
  } = useActionForm<FleetCreate, FleetCreate, unknown>({
    resolver: zodResolver(fleetCreateSchema),
    defaultValues: { name: fleet.name, description: fleet.description },
    fields: ['name', 'description'],
    action: (values) => {
      setError(undefined);
      return actions.update(slug, { id: fleet.id, ...values });
    },
    onSuccess: () => setEditing(false),
  });
  const shown = message?.tone === 'danger' ? message.text : error;
  const onDelete = () => {
    const moved = fleet.screenedFlights;
    const consequence = moved
      ? ` Its ${formatNumber(moved)} screened flight${moved === 1 ? '' : 's'} will count under their aircraft type's default fleet (or none); saved reports keep their figures.`
      : '';
    if (!confirm(`Delete the fleet “${fleet.name}”?${consequence}`)) return;
    start(async () => {
      setError(undefined);
      setMessage(undefined);
      const state = await actions.remove(slug, { id: fleet.id });
      if (state && !state.ok) setError(state.error.message);
    });
  };
  return (
    <li className="py-3">
      {editing ? (
        <form
          onSubmit={onSave}
          noValidate
          className="grid gap-3 sm:grid-cols-[1fr_1fr_auto] sm:items-end"
          aria-label={`Rename ${fleet.name}`}
        >
          <Field id={`fleet-${fleet.id}-name`} label="Name" error={errors.name?.message}>
            <TextInput id={`fleet-${fleet.id}-name`} invalid={!!errors.name} {...form.register('name')} />
          </Field>
          <Field id={`fleet-${fleet.id}-description`} label="Description" error={errors.description?.message}>
            <TextInput
              id={`fleet-${fleet.id}-description`}
              invalid={!!errors.description}
              {...form.register('description')}
            />
          </Field>
          <div className="flex gap-2">
            <Button type="submit" disabled={saving}>
              Save
            </Button>
            <Button variant="ghost" onClick={() => setEditing(false)}>
              Cancel
            </Button>
          </div>
        </form>
      ) : (
        <div className="flex flex-wrap items-start justify-between gap-3">
          <div>
            <p className="font-medium text-ink">{fleet.name}</p>
            {fleet.description ? <p className="text-sm text-ink-soft">{fleet.description}</p> : null}
            <p className="mt-0.5 text-xs text-ink-faint">
              {fleet.aircraftTypes.length
                ? `Default for ${fleet.aircraftTypes.map((t) => t.code).join(', ')}`
                : 'No aircraft type defaults to it'}{' '}
              · {formatNumber(fleet.screenedFlights)} screened flight{fleet.screenedFlights === 1 ? '' : 's'}
            </p>
          </div>
          {canWrite ? (
            <div className="flex gap-1">
              <Button variant="secondary" onClick={() => setEditing(true)} aria-label={`Rename ${fleet.name}`}>
                Rename
              </Button>
              <Button variant="ghost" disabled={pending} onClick={onDelete} aria-label={`Delete ${fleet.name}`}>
                Delete
              </Button>
            </div>
          ) : null}
        </div>
      )}
      {shown ? (
        <p role="alert" className="mt-1 text-xs font-medium text-danger">
          {shown}
        </p>
      ) : null}
    </li>
  );
}

export function FleetList({
  slug,
  fleets,
  actions,
  canWrite,
}: {
  slug: string;
  fleets: FleetItem[];
  actions: Actions;
  canWrite: boolean;
}) {
  return (
    <ul className="divide-y divide-line">
      {fleets.map((f) => (
        <FleetRow
          key={`${f.id}-${f.name}-${f.description}`}
          slug={slug}
          fleet={f}
          actions={actions}
          canWrite={canWrite}
        />
      ))}
    </ul>
  );
}

function TypeRow({
  slug,
  type,
  fleets,
  action,
  canWrite,
}: {
  slug: string;
  type: AircraftTypeItem;
  fleets: FleetItem[];
  action: Action;
  canWrite: boolean;
}) {
  const [pending, start] = useTransition();
  const [note, setNote] = useState<{ ok: boolean; text: string }>();
  const id = `type-${type.id}-fleet`;
  return (
    <tr className="border-t border-line align-top">
      <td className="py-2 pr-3">
        <span className="font-medium text-ink">{type.code}</span>
        {type.name ? <span className="block text-xs text-ink-faint">{type.name}</span> : null}
      </td>
      <td className="py-2">
        {canWrite ? (
          <>
            <label htmlFor={id} className="sr-only">
              Default fleet of {type.code}
            </label>
            <select
              id={id}
              defaultValue={type.defaultFleetId ?? ''}
              disabled={pending}
              onChange={(e) =>
                start(async () => {
                  setNote(undefined);
                  const state = await action(slug, {
                    aircraftTypeId: type.id,
                    fleetId: e.target.value ? Number(e.target.value) : null,
                  });
                  setNote(
                    state?.ok
                      ? { ok: true, text: 'Saved.' }
                      : { ok: false, text: state && !state.ok ? state.error.message : 'Not saved.' },
                  );
                })
              }
              className="rounded-md border border-line-strong bg-paper-raised px-2 py-1 text-sm"
            >
              <option value="">No default fleet</option>
              {fleets.map((f) => (
                <option key={f.id} value={f.id}>
                  {f.name}
                </option>
              ))}
            </select>
            {note ? (
              <span
                role={note.ok ? 'status' : 'alert'}
                className={`ml-2 text-xs ${note.ok ? 'text-tropo-strong' : 'font-medium text-danger'}`}
              >
                {note.text}
              </span>
            ) : null}
          </>
        ) : (
          <span className="text-ink-soft">
            {fleets.find((f) => f.id === type.defaultFleetId)?.name ?? 'No default fleet'}
          </span>
        )}
      </td>
    </tr>
  );
}

export function AircraftFleetTable({
  slug,
  types,
  fleets,
  action,
  canWrite,
}: {
  slug: string;
  types: AircraftTypeItem[];
  fleets: FleetItem[];
  action: Action;
  canWrite: boolean;
}) {
  return (
    <table className="w-full text-sm">
      <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
        <tr>
          <th scope="col" className="py-2">
            Aircraft type
          </th>
          <th scope="col" className="py-2">
            Default fleet
          </th>
        </tr>
      </thead>
      <tbody>
        {types.map((t) => (
          <TypeRow
            key={`${t.id}-${t.defaultFleetId ?? 'none'}`}
            slug={slug}
            type={t}
            fleets={fleets}
            action={action}
            canWrite={canWrite}
          />
        ))}
      </tbody>
    </table>
  );
}
