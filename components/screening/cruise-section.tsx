'use client';

import { useFieldArray, type UseFormReturn } from 'react-hook-form';
import { unitLabels, type ScreenFormValues } from '@/components/screening/screen-form-adapter';
import type { UnitSystem } from '@/lib/units';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FieldProblem, ModeSwitch, Section } from './screen-form-parts';
import type { AircraftChoice } from './screen-form-types';

/** Cruise: one flight level or step climbs (each at a distance or at a waypoint), and the Mach. */
export function CruiseSection({
  form,
  units,
  selectedAircraft,
  errorAt,
}: {
  form: UseFormReturn<ScreenFormValues>;
  units: UnitSystem;
  selectedAircraft: AircraftChoice | undefined;
  errorAt: (path: string) => string | undefined;
}) {
  const { control, register, setValue, formState } = form;
  const values = form.watch();
  const steps = useFieldArray({ control, name: 'steps' });
  const u = unitLabels(units);
  // Waypoints a step climb may start at: the route's intermediate points (index in the route).
  const stepWaypoints =
    values.routeMode === 'airports'
      ? values.airports
          .slice(1, -1)
          .map((a, k) => ({ index: k + 1, label: `${a.code.trim().toUpperCase() || `Stop ${k + 1}`} (stop ${k + 1})` }))
      : values.points
          .slice(1, -1)
          .map((p, k) => ({ index: k + 1, label: `Point ${k + 2}${p.lat && p.lon ? ` (${p.lat}, ${p.lon})` : ''}` }));
  return (
    <Section title="Cruise">
      <ModeSwitch
        legend="Cruise profile"
        name="cruiseMode"
        value={values.cruiseMode}
        options={[
          ['level', 'One flight level'],
          ['steps', 'Step climbs'],
        ]}
        onChange={(v) => setValue('cruiseMode', v, { shouldValidate: formState.isSubmitted })}
      />
      {values.cruiseMode === 'level' ? (
        <Field
          id="flightLevel"
          label="Flight level"
          hint="Hundreds of feet on 1013.25 hPa, such as 350 for FL350."
          error={errorAt('flightLevel')}
          className="max-w-xs"
        >
          <div className="flex items-center gap-2">
            <span className="text-sm font-medium text-ink-soft">FL</span>
            <TextInput
              id="flightLevel"
              inputMode="numeric"
              invalid={!!errorAt('flightLevel')}
              {...register('flightLevel')}
            />
          </div>
        </Field>
      ) : (
        <div className="space-y-3" data-testid="step-rows">
          {steps.fields.map((f, i) => (
            <div key={f.id} className="flex items-start gap-2" data-testid="step-row">
              {i === 0 ? (
                <div className="min-w-0 flex-1 space-y-1">
                  <span className="block text-sm font-medium text-ink">From</span>
                  <p className="py-2 text-sm text-ink-soft">departure (0 {u.distance})</p>
                </div>
              ) : (
                <div className="min-w-0 flex-1 space-y-2">
                  <Field
                    id={`steps-${i}-from`}
                    label={`Step ${i} starts at (${u.distance})`}
                    hint={
                      values.steps[i]?.at
                        ? 'Placed at the waypoint below.'
                        : `Distance from departure in ${u.distance}.`
                    }
                    error={errorAt(`steps.${i}.from`)}
                  >
                    <TextInput
                      id={`steps-${i}-from`}
                      inputMode="decimal"
                      disabled={!!values.steps[i]?.at}
                      invalid={!!errorAt(`steps.${i}.from`)}
                      {...register(`steps.${i}.from`)}
                    />
                  </Field>
                  {stepWaypoints.length ? (
                    <Field id={`steps-${i}-at`} label={`or step ${i} at a waypoint`}>
                      <SelectInput id={`steps-${i}-at`} {...register(`steps.${i}.at`)}>
                        <option value="">No: at the distance above</option>
                        {stepWaypoints.map((w) => (
                          <option key={w.index} value={w.index}>
                            {w.label}
                          </option>
                        ))}
                      </SelectInput>
                    </Field>
                  ) : null}
                </div>
              )}
              <Field
                id={`steps-${i}-flightLevel`}
                label={i === 0 ? 'Initial flight level' : `Step ${i} flight level`}
                error={errorAt(`steps.${i}.flightLevel`)}
                className="min-w-0 flex-1"
              >
                <TextInput
                  id={`steps-${i}-flightLevel`}
                  inputMode="numeric"
                  invalid={!!errorAt(`steps.${i}.flightLevel`)}
                  {...register(`steps.${i}.flightLevel`)}
                />
              </Field>
              {i > 0 ? (
                <Button
                  variant="ghost"
                  className="mt-6"
                  onClick={() => steps.remove(i)}
                  aria-label={`Remove step ${i}`}
                >
                  Remove
                </Button>
              ) : (
                <span className="hidden w-[74px] shrink-0 sm:block" aria-hidden />
              )}
            </div>
          ))}
          <FieldProblem message={errorAt('steps')} />
          <Button
            variant="secondary"
            onClick={() => {
              const last = values.steps[values.steps.length - 1];
              const fl = Number(last?.flightLevel);
              steps.append({
                from: '',
                flightLevel: Number.isFinite(fl) ? String(Math.min(660, fl + 20)) : '',
                at: '',
              });
            }}
            disabled={steps.fields.length >= 50}
          >
            Add a step climb
          </Button>
        </div>
      )}
      <Field
        id="mach"
        label="Cruise Mach (optional)"
        hint={
          selectedAircraft && values.emissionMode === 'aircraft'
            ? `Blank: the type's typical Mach ${selectedAircraft.typicalMach}.`
            : 'Blank: Mach 0.80. Used for timing along the route.'
        }
        error={errorAt('mach')}
        className="max-w-xs"
      >
        <TextInput
          id="mach"
          inputMode="decimal"
          placeholder={
            selectedAircraft && values.emissionMode === 'aircraft' ? String(selectedAircraft.typicalMach) : '0.80'
          }
          invalid={!!errorAt('mach')}
          {...register('mach')}
        />
      </Field>
    </Section>
  );
}
