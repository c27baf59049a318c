'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { engineSaveSchema, LTO_MODES, type EngineForm as Values, type EngineSave } from '@/lib/validation/library';
import type { ActionState } from '@/lib/errors';
import { Field, TextArea, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';
import { CRUISE_CHECK, cruiseEiCheck } from '@/lib/library/cruise-ei-check';
import { CruiseCheckTag } from './cruise-check-tag';

const KNOWN = [
  'name',
  'source',
  ...[0, 1, 2, 3].flatMap((i) => [`fuelFlowKgS.${i}`, `eiNoxGPerKg.${i}`]),
  'fuelFlowKgS',
  'eiNoxGPerKg',
];

function liveCheck(ff: unknown, ei: unknown) {
  const parsed = engineSaveSchema.safeParse({ name: 'check', fuelFlowKgS: ff, eiNoxGPerKg: ei });
  if (parsed.success) return cruiseEiCheck(parsed.data);
  const all = [ff, ei].every(
    (q) => Array.isArray(q) && q.length === 4 && q.every((v) => typeof v === 'number' && Number.isFinite(v)),
  );
  return all ? 'invalid' : 'incomplete';
}

type Props = { action: (values: Values) => Promise<ActionState<{ id: number }>>; initial?: EngineSave };

/** A new engine's form starts empty again after each save (remounted), an existing one keeps its values. */
export function EngineForm(props: Props) {
  const [round, setRound] = useState(0);
  const [saved, setSaved] = useState<string>();
  return (
    <EngineFormBody
      key={round}
      {...props}
      savedMessage={saved}
      onCreated={(text) => {
        setSaved(text);
        setRound((r) => r + 1);
      }}
    />
  );
}

/**
 * An engine's certification data: per LTO mode (idle 7 %, approach 30 %, climb-out 85 %, take-off
 * 100 %) the fuel flow per engine in kg/s and the EI NOx in g/kg, as on the certification data
 * sheet, plus a note of the source. Shows the cruise EI check as the numbers are typed.
 */
function EngineFormBody({
  action,
  initial,
  savedMessage,
  onCreated,
}: Props & { savedMessage?: string; onCreated: (message: string) => void }) {
  const router = useRouter();
  const isNew = !initial;
  const { form, errors, pending, message, onSubmit } = useActionForm<Values, EngineSave, unknown>({
    resolver: zodResolver(engineSaveSchema),
    defaultValues: initial ?? { name: '', source: '' },
    fields: KNOWN,
    action,
    initialMessage: savedMessage ? { tone: 'success', text: savedMessage } : undefined,
    onSuccess: (state) => {
      router.refresh();
      if (isNew) onCreated(state.message ?? 'Engine added.');
      else return state.message ?? 'Saved.';
    },
  });
  const [ff, ei] = useWatch({ control: form.control, name: ['fuelFlowKgS', 'eiNoxGPerKg'] });
  const check = liveCheck(ff, ei);
  const p = isNew ? 'new-engine' : 'engine';
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <Field id={`${p}-name`} label="Engine name" error={errors.name?.message} hint="Unique in this workspace.">
        <TextInput id={`${p}-name`} autoComplete="off" invalid={!!errors.name} {...form.register('name')} />
      </Field>
      <fieldset>
        <legend className="text-sm font-medium text-ink">Certification data per engine (ICAO LTO modes)</legend>
        <p className="mt-0.5 text-xs text-ink-faint">
          Fuel flow in kg/s must rise from idle to take-off; EI NOx in g NO2 per kg of fuel, above 0 and at most 200.
        </p>
        {errors.fuelFlowKgS?.root?.message || errors.fuelFlowKgS?.message ? (
          <p role="alert" className="mt-1 text-xs font-medium text-danger">
            {errors.fuelFlowKgS?.root?.message ?? errors.fuelFlowKgS?.message}
          </p>
        ) : null}
        <div className="mt-2 grid grid-cols-[minmax(6.5rem,auto)_1fr_1fr] items-start gap-x-3 gap-y-2">
          <span className="text-xs font-medium uppercase tracking-wide text-ink-soft">Mode</span>
          <span className="text-xs font-medium uppercase tracking-wide text-ink-soft">Fuel flow, kg/s</span>
          <span className="text-xs font-medium uppercase tracking-wide text-ink-soft">EI NOx, g/kg</span>
          {LTO_MODES.map((mode, n) => {
            const i = n as 0 | 1 | 2 | 3;
            const cell = (key: 'ff' | 'ei', field: 'fuelFlowKgS' | 'eiNoxGPerKg', label: string) => {
              const id = `${p}-${key}-${i}`;
              const error = errors[field]?.[i]?.message;
              return (
                <div>
                  <label htmlFor={id} className="sr-only">{`${mode.label} ${label}`}</label>
                  <TextInput
                    id={id}
                    inputMode="decimal"
                    className="figure"
                    invalid={!!error}
                    {...form.register(`${field}.${i}`, { valueAsNumber: true })}
                  />
                  {error ? (
                    <p id={`${id}-error`} role="alert" className="mt-1 text-xs font-medium text-danger">
                      {error}
                    </p>
                  ) : null}
                </div>
              );
            };
            return (
              <div key={mode.key} className="contents">
                <span className="pt-2 text-sm text-ink">
                  {mode.label} <span className="text-ink-faint">{mode.thrust}</span>
                </span>
                {cell('ff', 'fuelFlowKgS', 'fuel flow (kg/s)')}
                {cell('ei', 'eiNoxGPerKg', 'EI NOx (g/kg)')}
              </div>
            );
          })}
        </div>
      </fieldset>
      <div className="rounded-md border border-line bg-paper-sunk px-3 py-2 text-sm" aria-live="polite">
        <span className="font-medium">Cruise check</span>{' '}
        <span className="text-ink-soft">
          (BFFM2 at FL{CRUISE_CHECK.flightLevel}, Mach {CRUISE_CHECK.mach.toFixed(2)}, ISA):
        </span>{' '}
        {check === 'incomplete' ? (
          <span className="text-ink-faint">fill in all eight values to see it</span>
        ) : check === 'invalid' ? (
          <span className="text-ink-faint">correct the values marked above to see it</span>
        ) : (
          <CruiseCheckTag check={check} />
        )}
      </div>
      <Field
        id={`${p}-source`}
        label="Source of the values"
        error={errors.source?.message}
        hint="The data sheet, issue and date, or who supplied the numbers."
      >
        <TextArea id={`${p}-source`} rows={2} invalid={!!errors.source} {...form.register('source')} />
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? 'Saving…' : isNew ? 'Add engine' : 'Save changes'}
      </Button>
    </form>
  );
}
