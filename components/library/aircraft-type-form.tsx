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
import { Field, InputField, SelectInput } from '@/components/ui/field';
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
type NumberName = 'directEiGPerKg' | 'engineCount' | 'typicalMach' | 'typicalFlightLevel';

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
  const numberField = (name: NumberName, id: string, label: string, hint?: string) => (
    <InputField
      id={`${p}-${id}`}
      label={label}
      error={errors[name]?.message}
      hint={hint}
      inputMode={name === 'engineCount' || name === 'typicalFlightLevel' ? 'numeric' : 'decimal'}
      className="figure"
      {...form.register(name, name === 'directEiGPerKg' ? { setValueAs: numberOrNull } : { valueAsNumber: true })}
    />
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <div className="grid gap-4 sm:grid-cols-[8rem_1fr]">
        <InputField
          id={`${p}-code`}
          label="Type code"
          error={errors.code?.message}
          hint="Such as SK-LR1; kept in capitals."
          autoComplete="off"
          className="font-mono uppercase"
          {...form.register('code')}
        />
        <InputField
          id={`${p}-name`}
          label="Name"
          error={errors.name?.message}
          autoComplete="off"
          {...form.register('name')}
        />
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
            numberField(
              'directEiGPerKg',
              'direct',
              'Cruise EI NOx (g/kg)',
              'For types without certification data, such as a supersonic concept: a measured or published cruise value, 0-200 g/kg.',
            )
          )}
          {numberField('engineCount', 'count', 'Engines', '1 to 8')}
        </div>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2">
        {numberField('typicalMach', 'mach', 'Typical cruise Mach')}
        {numberField('typicalFlightLevel', 'fl', 'Typical cruise flight level', 'Hundreds of feet, such as 370')}
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
