'use client';

import type { UseFormReturn } from 'react-hook-form';
import { unitLabels, type ScreenFormValues } from '@/components/screening/screen-form-adapter';
import type { UnitSystem } from '@/lib/units';
import { Field, InputField, SelectInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formatAltitude, formatNumber, MONTH_NAMES } from '@/lib/format';
import { ModeSwitch, Section } from './screen-form-parts';
import type { SoundingChoice } from './screen-form-types';

/** Flight date or month, and the tropopause: climatology, a given altitude or pressure, or a stored sounding. */
export function TropopauseSection({
  form,
  units,
  soundings,
  errorAt,
}: {
  form: UseFormReturn<ScreenFormValues>;
  units: UnitSystem;
  soundings: SoundingChoice[];
  errorAt: (path: string) => string | undefined;
}) {
  const { register, setValue, formState } = form;
  const values = form.watch();
  const u = unitLabels(units);
  const selectedSounding = soundings.find((s) => String(s.id) === values.soundingId);
  /** A tropopause given by hand, used along the whole route. */
  const given = (name: 'tropopauseAltitude' | 'tropopausePressure', label: string, hint: string) => (
    <InputField
      id={name}
      label={label}
      hint={hint}
      error={errorAt(name)}
      fieldClassName="max-w-xs"
      inputMode="decimal"
      {...register(name)}
    />
  );
  return (
    <Section title="Date and tropopause">
      <div className="grid gap-3 sm:grid-cols-2">
        <InputField
          id="flightDate"
          label="Flight date"
          hint="Its month picks the seasonal tropopause height at each latitude."
          error={errorAt('flightDate')}
          type="date"
          {...register('flightDate')}
        />
        <Field
          id="month"
          label="Month for the tropopause"
          hint="Without a date or month, the annual mean is used."
          error={errorAt('month')}
        >
          <SelectInput id="month" invalid={!!errorAt('month')} {...register('month')}>
            <option value="">From the flight date</option>
            {MONTH_NAMES.map((m, i) => (
              <option key={m} value={i + 1}>
                {m}
              </option>
            ))}
          </SelectInput>
        </Field>
      </div>
      <ModeSwitch
        legend="Tropopause"
        name="tropopauseMode"
        value={values.tropopauseMode}
        options={[
          ['climatology', 'By latitude and month'],
          ['altitude', 'Altitude'],
          ['pressure', 'Pressure'],
          ['sounding', 'Stored sounding'],
        ]}
        onChange={(v) => setValue('tropopauseMode', v, { shouldValidate: formState.isSubmitted })}
      />
      {values.tropopauseMode === 'climatology' ? (
        <p className="text-xs text-ink-soft">
          A climatological tropopause by latitude and season along the whole route (typical error about 0.9 km).
        </p>
      ) : null}
      {values.tropopauseMode === 'altitude'
        ? given(
            'tropopauseAltitude',
            `Tropopause altitude (${u.altitude})`,
            'Taken as a pressure altitude and used along the whole route.',
          )
        : null}
      {values.tropopauseMode === 'pressure'
        ? given('tropopausePressure', 'Tropopause pressure (hPa)', 'Used along the whole route.')
        : null}
      {values.tropopauseMode === 'sounding' ? (
        soundings.length ? (
          <Field
            id="soundingId"
            label="Stored sounding"
            hint={
              selectedSounding
                ? selectedSounding.tropopause
                  ? `Its tropopause: ${formatAltitude(selectedSounding.tropopause.altitudeM, units)}, ${formatNumber(selectedSounding.tropopause.pressureHpa, 0)} hPa; used along the whole route.`
                  : 'No lapse-rate tropopause was found in this sounding.'
                : 'Its lapse-rate tropopause is used along the whole route.'
            }
            error={errorAt('soundingId')}
          >
            <SelectInput id="soundingId" invalid={!!errorAt('soundingId')} {...register('soundingId')}>
              <option value="">Choose a sounding…</option>
              {soundings.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                  {s.station ? ` — ${s.station}` : ''}
                  {s.observedAt ? `, ${s.observedAt.slice(0, 16).replace('T', ' ')}` : ''}
                </option>
              ))}
            </SelectInput>
          </Field>
        ) : (
          <Notice tone="info">
            No soundings stored yet. Upload one under Soundings, or give the tropopause altitude or pressure.
          </Notice>
        )
      ) : null}
    </Section>
  );
}
