'use client';

import type { UseFormRegister } from 'react-hook-form';
import { OZONE_PROFILE_NAMES } from '@/lib/validation/screening';
import {
  BAND_KEYS,
  type AssumptionDefaults,
  type BandKey,
  type ScreenFormValues,
} from '@/components/screening/screen-form-adapter';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { sci } from './assumptions-list';

const BAND_LABELS: Record<BandKey, string> = {
  jO3NoonPerS: 'J(O3 → O), overhead sun, s⁻¹',
  jNo2NoonPerS: 'J(NO2), overhead sun, s⁻¹',
  daylightFactor: 'Daylight factor (blank: from the sun at the flight’s date and latitude; 0.5 at an equinox)',
  noxToNoyFraction: 'NOx share of NOy',
};

const PROFILE_LABELS: Record<(typeof OZONE_PROFILE_NAMES)[number], string> = {
  tropical: 'Tropical',
  'midlatitude-summer': 'Mid-latitude summer',
  'midlatitude-winter': 'Mid-latitude winter',
  'subarctic-summer': 'Subarctic summer',
  'subarctic-winter': 'Subarctic winter',
};

/** The ozone-figure inputs, folded away; blank keeps the documented default shown beside each. */
export function AssumptionFields({
  register,
  defaults,
  errorAt,
}: {
  register: UseFormRegister<ScreenFormValues>;
  defaults: AssumptionDefaults;
  errorAt: (path: string) => string | undefined;
}) {
  const rt = defaults.residenceTime;
  return (
    <details className="rounded-card border border-line bg-paper-raised p-4" data-testid="assumption-fields">
      <summary className="cursor-pointer text-sm font-semibold text-ink">Ozone-figure assumptions (advanced)</summary>
      <div className="mt-4 space-y-5">
        <p className="text-xs text-ink-soft">
          Leave a box blank to keep the default shown in it. The low and high cases are worked out with all inputs at
          their low or high values together, so the range is deliberately wide. These inputs change the ozone figure
          only, not the NOx.
        </p>
        {BAND_KEYS.map((key) => {
          const d = defaults[key];
          return (
            <fieldset key={key} className="space-y-2">
              <legend className="text-sm font-medium text-ink">{BAND_LABELS[key]}</legend>
              <div className="grid grid-cols-3 gap-2">
                {(['low', 'central', 'high'] as const).map((part) => {
                  const id = `assumptions-${key}-${part}`;
                  const error = errorAt(`assumptions.${key}.${part}`);
                  return (
                    <Field
                      key={part}
                      id={id}
                      label={<span className="text-xs font-normal text-ink-soft">{part}</span>}
                      error={error}
                    >
                      <TextInput
                        id={id}
                        inputMode="decimal"
                        placeholder={sci(d[part])}
                        invalid={!!error}
                        {...register(`assumptions.${key}.${part}`)}
                      />
                    </Field>
                  );
                })}
              </div>
            </fieldset>
          );
        })}
        <div className="grid gap-3 sm:grid-cols-2">
          {(
            [
              [
                'ohCm3',
                'OH, molecules per cm³',
                `Default ${sci(defaults.ohCm3)}; sets the chain length.`,
                sci(defaults.ohCm3),
              ],
              [
                'ho2Cm3',
                'HO2, molecules per cm³',
                `Default ${sci(defaults.ho2Cm3)}; local budget only.`,
                sci(defaults.ho2Cm3),
              ],
              [
                'relativeHumidity',
                'Relative humidity at cruise (%)',
                `Default ${Math.round(defaults.relativeHumidity * 100)} %; used by the fuel-flow EI methods.`,
                String(Math.round(defaults.relativeHumidity * 100)),
              ],
            ] as const
          ).map(([key, label, hint, placeholder]) => (
            <Field key={key} id={`assumptions-${key}`} label={label} hint={hint} error={errorAt(`assumptions.${key}`)}>
              <TextInput
                id={`assumptions-${key}`}
                inputMode="decimal"
                placeholder={placeholder}
                invalid={!!errorAt(`assumptions.${key}`)}
                {...register(`assumptions.${key}`)}
              />
            </Field>
          ))}
          <Field
            id="assumptions-ozoneProfile"
            label="Ozone profile"
            hint="Default: chosen by latitude band and season."
            error={errorAt('assumptions.ozoneProfile')}
          >
            <SelectInput
              id="assumptions-ozoneProfile"
              invalid={!!errorAt('assumptions.ozoneProfile')}
              {...register('assumptions.ozoneProfile')}
            >
              <option value="">By latitude and season (default)</option>
              {OZONE_PROFILE_NAMES.map((n) => (
                <option key={n} value={n}>
                  {PROFILE_LABELS[n]} for the whole route
                </option>
              ))}
            </SelectInput>
          </Field>
        </div>
        <p className="text-xs text-ink-soft">
          Residence time above the tropopause (fixed here; the API accepts other values):{' '}
          {rt.depthKm.map((dk, i) => `${dk} km ${rt.years[i]} yr`).join(', ')}, × {rt.lowFactor} for the low case and ×{' '}
          {rt.highFactor} for the high case.
        </p>
      </div>
    </details>
  );
}
