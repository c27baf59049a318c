'use client';

import type { UseFormReturn } from 'react-hook-form';
import { unitLabels, type ScreenFormValues } from '@/components/screening/screen-form-adapter';
import type { UnitSystem } from '@/lib/units';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ModeSwitch, Section } from './screen-form-parts';
import type { AircraftChoice, EngineChoice } from './screen-form-types';

/** Fuel and the EI NOx: from the aircraft type, an engine, or given directly. */
export function EmissionSection({
  form,
  units,
  aircraft,
  engines,
  errorAt,
}: {
  form: UseFormReturn<ScreenFormValues>;
  units: UnitSystem;
  aircraft: AircraftChoice[];
  engines: EngineChoice[];
  errorAt: (path: string) => string | undefined;
}) {
  const { register, setValue, formState } = form;
  const values = form.watch();
  const u = unitLabels(units);
  const selectedAircraft = aircraft.find((a) => a.code === values.aircraft);
  const showMethod =
    values.emissionMode === 'engine' ||
    (values.emissionMode === 'aircraft' && !!selectedAircraft?.emission && 'engine' in selectedAircraft.emission);
  return (
    <Section title="Fuel and emission">
      <Field
        id="fuelBurn"
        label={`Cruise fuel burn (${u.mass})`}
        hint="Fuel burned along the entered track at cruise; climb and descent are not modelled."
        error={errorAt('fuelBurn')}
        className="max-w-xs"
      >
        <TextInput id="fuelBurn" inputMode="decimal" invalid={!!errorAt('fuelBurn')} {...register('fuelBurn')} />
      </Field>
      <ModeSwitch
        legend="EI NOx"
        name="emissionMode"
        value={values.emissionMode}
        options={[
          ['aircraft', 'From the aircraft type'],
          ['engine', 'From an engine'],
          ['direct', 'Given directly'],
        ]}
        onChange={(v) => setValue('emissionMode', v, { shouldValidate: formState.isSubmitted })}
      />
      {values.emissionMode === 'aircraft' ? (
        aircraft.length ? (
          <Field
            id="aircraft"
            label="Aircraft type"
            hint={
              selectedAircraft
                ? selectedAircraft.engineName
                  ? `${selectedAircraft.engineCount} × ${selectedAircraft.engineName}; typical FL${selectedAircraft.typicalFlightLevel}, Mach ${selectedAircraft.typicalMach}.`
                  : selectedAircraft.directEiGPerKg !== null
                    ? `Cruise EI NOx ${selectedAircraft.directEiGPerKg} g/kg given for the type; typical FL${selectedAircraft.typicalFlightLevel}.`
                    : 'This type has no engine or EI yet: add one under Engines & aircraft.'
                : undefined
            }
            error={errorAt('aircraft')}
          >
            <SelectInput
              id="aircraft"
              invalid={!!errorAt('aircraft')}
              {...register('aircraft', {
                onChange: (e: { target: { value: string } }) => {
                  const type = aircraft.find((a) => a.code === e.target.value);
                  if (type && !form.getFieldState('flightLevel').isDirty)
                    setValue('flightLevel', String(type.typicalFlightLevel));
                },
              })}
            >
              <option value="">Choose an aircraft type…</option>
              {aircraft.map((a) => (
                <option key={a.code} value={a.code}>
                  {a.code}
                  {a.name ? ` — ${a.name}` : ''}
                </option>
              ))}
            </SelectInput>
          </Field>
        ) : (
          <Notice tone="info">
            No aircraft types in this workspace yet. Add one under Engines &amp; aircraft, or choose an engine or give
            the EI NOx.
          </Notice>
        )
      ) : null}
      {values.emissionMode === 'engine' ? (
        engines.length ? (
          <div className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_10rem]">
            <Field id="engineId" label="Engine (certification data)" error={errorAt('engineId')}>
              <SelectInput id="engineId" invalid={!!errorAt('engineId')} {...register('engineId')}>
                <option value="">Choose an engine…</option>
                {engines.map((e) => (
                  <option key={e.id} value={e.id}>
                    {e.name}
                  </option>
                ))}
              </SelectInput>
            </Field>
            <Field id="engineCount" label="Engines" error={errorAt('engineCount')}>
              <TextInput
                id="engineCount"
                inputMode="numeric"
                invalid={!!errorAt('engineCount')}
                {...register('engineCount')}
              />
            </Field>
          </div>
        ) : (
          <Notice tone="info">
            No engines in this workspace yet. Add one under Engines &amp; aircraft, or give the EI NOx.
          </Notice>
        )
      ) : null}
      {showMethod ? (
        <Field
          id="method"
          label="Fuel-flow method"
          hint="Both are worked out; this one gives the figures, the other is shown beside it."
          className="max-w-sm"
        >
          <SelectInput id="method" {...register('method')}>
            <option value="bffm2">Boeing Fuel Flow Method 2</option>
            <option value="dlr">DLR fuel-flow method</option>
          </SelectInput>
        </Field>
      ) : null}
      {values.emissionMode === 'direct' ? (
        <Field
          id="eiNox"
          label="Cruise EI NOx (g NO2 per kg fuel)"
          hint="A measured or published cruise value; preferred above Mach 1."
          error={errorAt('eiNox')}
          className="max-w-xs"
        >
          <TextInput id="eiNox" inputMode="decimal" invalid={!!errorAt('eiNox')} {...register('eiNox')} />
        </Field>
      ) : null}
    </Section>
  );
}
