'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  aircraftTypeSaveSchema,
  type AircraftTypeForm as Values,
  type AircraftTypeSave,
} from '@/lib/validation/library';
import type { ActionState } from '@/lib/errors';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';

const KNOWN = [
  'code',
  'name',
  'engineId',
  'directEiGPerKg',
  'engineCount',
  'typicalMach',
  'typicalFlightLevel',
  'defaultFleetId',
];
const numberOrNull = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

type Choice = { id: number; name: string };

/**
 * An aircraft type: code, name, its emission (an engine of the workspace with the engine count,
 * or a direct cruise EI NOx for a type without certification data), typical Mach and cruise
 * flight level, and the fleet its flights fall into by default.
 */
export function AircraftTypeForm({
  action,
  initial,
  engines,
  fleets,
  fleetsHref,
}: {
  action: (values: Values) => Promise<ActionState<{ id: number }>>;
  initial?: AircraftTypeSave;
  engines: Choice[];
  fleets: Choice[];
  fleetsHref: string;
}) {
  const router = useRouter();
  const [kind, setKind] = useState<'engine' | 'direct'>(
    initial && initial.engineId === null && initial.directEiGPerKg !== null ? 'direct' : 'engine',
  );
  const blank: Values = {
    code: '',
    name: '',
    engineId: null,
    directEiGPerKg: null,
    engineCount: 2,
    typicalMach: 0.8,
    typicalFlightLevel: 350,
    defaultFleetId: null,
  };
  const isNew = !initial;
  const { form, errors, pending, message, onSubmit } = useActionForm({
    resolver: zodResolver(aircraftTypeSaveSchema),
    defaultValues: initial ?? blank,
    fields: KNOWN,
    action,
    onSuccess: (state) => {
      if (isNew) {
        form.reset(blank);
        setKind('engine');
      }
      router.refresh();
      return state.message ?? 'Saved.';
    },
  });
  const choose = (next: 'engine' | 'direct') => {
    setKind(next);
    if (next === 'engine') form.setValue('directEiGPerKg', null);
    else form.setValue('engineId', null);
    form.clearErrors(['engineId', 'directEiGPerKg']);
  };
  const p = isNew ? 'new-type' : 'type';
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <div className="grid gap-4 sm:grid-cols-[8rem_1fr]">
        <Field id={`${p}-code`} label="Type code" error={errors.code?.message} hint="Such as SK-LR1; kept in capitals.">
          <TextInput
            id={`${p}-code`}
            autoComplete="off"
            className="font-mono uppercase"
            invalid={!!errors.code}
            {...form.register('code')}
          />
        </Field>
        <Field id={`${p}-name`} label="Name" error={errors.name?.message}>
          <TextInput id={`${p}-name`} autoComplete="off" invalid={!!errors.name} {...form.register('name')} />
        </Field>
      </div>
      <fieldset className="space-y-3">
        <legend className="text-sm font-medium text-ink">Emission</legend>
        <div className="flex flex-wrap gap-4 text-sm">
          <label className="inline-flex items-center gap-2">
            <input type="radio" name={`${p}-kind`} checked={kind === 'engine'} onChange={() => choose('engine')} />
            Engine certification data
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name={`${p}-kind`} checked={kind === 'direct'} onChange={() => choose('direct')} />
            Direct cruise EI NOx
          </label>
        </div>
        <div className="grid gap-4 sm:grid-cols-[1fr_8rem]">
          {kind === 'engine' ? (
            <Field
              id={`${p}-engine`}
              label="Engine"
              error={errors.engineId?.message}
              hint={engines.length === 0 ? 'Add an engine first, below.' : undefined}
            >
              <SelectInput
                id={`${p}-engine`}
                invalid={!!errors.engineId}
                {...form.register('engineId', { setValueAs: numberOrNull })}
              >
                <option value="">Choose an engine…</option>
                {engines.map((e) => (
                  <option key={e.id} value={e.id}>
                    {e.name}
                  </option>
                ))}
              </SelectInput>
            </Field>
          ) : (
            <Field
              id={`${p}-direct`}
              label="Cruise EI NOx (g/kg)"
              error={errors.directEiGPerKg?.message}
              hint="For types without certification data, such as a supersonic concept: a measured or published cruise value, 0-200 g/kg."
            >
              <TextInput
                id={`${p}-direct`}
                inputMode="decimal"
                className="figure"
                invalid={!!errors.directEiGPerKg}
                {...form.register('directEiGPerKg', { setValueAs: numberOrNull })}
              />
            </Field>
          )}
          <Field id={`${p}-count`} label="Engines" error={errors.engineCount?.message} hint="1 to 8">
            <TextInput
              id={`${p}-count`}
              inputMode="numeric"
              className="figure"
              invalid={!!errors.engineCount}
              {...form.register('engineCount', { valueAsNumber: true })}
            />
          </Field>
        </div>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id={`${p}-mach`} label="Typical cruise Mach" error={errors.typicalMach?.message}>
          <TextInput
            id={`${p}-mach`}
            inputMode="decimal"
            className="figure"
            invalid={!!errors.typicalMach}
            {...form.register('typicalMach', { valueAsNumber: true })}
          />
        </Field>
        <Field
          id={`${p}-fl`}
          label="Typical cruise flight level"
          error={errors.typicalFlightLevel?.message}
          hint="Hundreds of feet, such as 370"
        >
          <TextInput
            id={`${p}-fl`}
            inputMode="numeric"
            className="figure"
            invalid={!!errors.typicalFlightLevel}
            {...form.register('typicalFlightLevel', { valueAsNumber: true })}
          />
        </Field>
      </div>
      <Field
        id={`${p}-fleet`}
        label="Default fleet"
        error={errors.defaultFleetId?.message}
        hint={
          fleets.length === 0 ? (
            <>
              No fleets yet; create them under{' '}
              <a href={fleetsHref} className="text-accent underline">
                Fleets
              </a>
              .
            </>
          ) : (
            'Flights of this type count in this fleet unless their schedule says otherwise.'
          )
        }
      >
        <SelectInput
          id={`${p}-fleet`}
          invalid={!!errors.defaultFleetId}
          {...form.register('defaultFleetId', { setValueAs: numberOrNull })}
        >
          <option value="">No default fleet</option>
          {fleets.map((f) => (
            <option key={f.id} value={f.id}>
              {f.name}
            </option>
          ))}
        </SelectInput>
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? 'Saving…' : isNew ? 'Add aircraft type' : 'Save changes'}
      </Button>
    </form>
  );
}
