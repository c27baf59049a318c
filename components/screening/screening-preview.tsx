'use client';

import type { CruiseLevelRow, MinimiseCriterion, MonthRow, ScreeningResult } from '@/lib/screening';
import type { UnitSystem } from '@/lib/units';
import { Card } from '@/components/ui/card';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { VerticalProfileChart } from '@/components/charts/vertical-profile-chart';
import { HeadlineFigures } from './headline-figures';
import { WhatIfTable } from './what-if-table';
import { ScreeningCautions } from './cautions';
import { profileSeries } from './profile-series';
import { UncertaintyDriversChart } from './uncertainty-drivers';
import { MonthStrip } from './month-strip';
import { fuelWarningOf } from '@/lib/validation/plausibility';

export interface PreviewResponse {
  input: unknown;
  aircraft: string | null;
  result: ScreeningResult;
  levels: CruiseLevelRow[];
  months?: { rows: MonthRow[]; sameEveryMonth: boolean; note: string | null };
}

interface Props {
  units: UnitSystem;
  data: PreviewResponse | undefined;
  /** What keeps the preview from running, in the form's words (first few problems). */
  waitingFor: string[];
  fetching: boolean;
  stale: boolean;
  error: string | null;
  limit: string;
  limitError: string | null;
  limitPct: number;
  ratePct: number;
  onLimitChange: (value: string) => void;
  /** What the mark minimises (default the ozone figure). */
  minimise?: MinimiseCriterion;
  onMinimiseChange?: (value: MinimiseCriterion) => void;
}

/** The live preview beside the form: headline figures, a small profile and the other levels. */
export function ScreeningPreview({
  units,
  data,
  waitingFor,
  fetching,
  stale,
  error,
  limit,
  limitError,
  limitPct,
  ratePct,
  onLimitChange,
  minimise = 'ozone-figure',
  onMinimiseChange,
}: Props) {
  let status: string;
  if (waitingFor.length) status = 'Waiting for complete input';
  else if (error) status = 'Preview not updated';
  else if (fetching || stale) status = 'Updating…';
  else if (data) status = 'Up to date';
  else status = 'Preview';
  return (
    <Card
      title="Preview"
      actions={
        <span
          role="status"
          aria-live="polite"
          data-testid="preview-status"
          className="text-xs font-medium text-ink-soft"
        >
          {status}
        </span>
      }
    >
      <div className="space-y-4">
        {waitingFor.length ? (
          <Notice tone="info" title="To see a preview">
            <ul className="list-disc pl-5">
              {waitingFor.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          </Notice>
        ) : null}
        {error ? (
          <Notice tone="danger" role="alert">
            {error}
          </Notice>
        ) : null}
        {data ? (
          <div
            className={`space-y-4 transition-opacity ${fetching || stale || waitingFor.length ? 'opacity-60' : ''}`}
            data-testid="preview-figures"
          >
            {fuelWarningOf(data.result) ? (
              <Notice tone="caution" title="Check the fuel">
                {fuelWarningOf(data.result)}
              </Notice>
            ) : null}
            <HeadlineFigures result={data.result} units={units} compact bands={data.result.uncertainty} />
            <VerticalProfileChart
              series={profileSeries(data.result.segments, units)}
              label="Preview of the cruise altitude and tropopause"
              height={220}
            />
            {data.result.uncertainty ? (
              <div>
                <h3 className="mb-2 text-sm font-semibold text-ink">What moves these figures</h3>
                <UncertaintyDriversChart drivers={data.result.uncertainty.drivers} compact />
              </div>
            ) : null}
            {data.months ? (
              <div>
                <h3 className="mb-2 text-sm font-semibold text-ink">Across the year</h3>
                <MonthStrip
                  rows={data.months.rows}
                  plannedMonth={data.result.month}
                  units={units}
                  note={data.months.note}
                />
              </div>
            ) : null}
            <div>
              <div className="mb-2 flex flex-wrap items-end gap-3">
                <h3 className="w-full text-sm font-semibold text-ink">Other cruise levels</h3>
                <Field
                  id="preview-limit"
                  label="Fuel-penalty limit (%)"
                  error={limitError ?? undefined}
                  className="w-44"
                >
                  <TextInput
                    id="preview-limit"
                    inputMode="decimal"
                    value={limit}
                    onChange={(e) => onLimitChange(e.target.value)}
                    invalid={!!limitError}
                  />
                </Field>
                {onMinimiseChange ? (
                  <Field id="preview-minimise" label="Mark the least" className="w-60">
                    <SelectInput
                      id="preview-minimise"
                      value={minimise}
                      onChange={(e) =>
                        onMinimiseChange(
                          e.target.value === 'nox-above-tropopause' ? 'nox-above-tropopause' : 'ozone-figure',
                        )
                      }
                    >
                      <option value="ozone-figure">ozone figure (gross loss)</option>
                      <option value="nox-above-tropopause">NOx above the tropopause</option>
                    </SelectInput>
                  </Field>
                ) : null}
              </div>
              <WhatIfTable rows={data.levels} units={units} limitPct={limitPct} ratePctPer1000Ft={ratePct} compact />
            </div>
            <ScreeningCautions cautions={data.result.cautions} />
          </div>
        ) : !waitingFor.length && !error ? (
          <p className="text-sm text-ink-soft">Working out the first figures…</p>
        ) : null}
      </div>
    </Card>
  );
}
