'use client';

import type { ReactNode } from 'react';
import type { UnitSystem } from '@/lib/units';
import { formatMass, formatPercent } from '@/lib/format';
import type { PreviewResponse } from './screening-preview';

export function ModeSwitch<T extends string>({
  legend,
  name,
  value,
  options,
  onChange,
}: {
  legend: string;
  name: string;
  value: T;
  options: [T, string][];
  onChange: (v: T) => void;
}) {
  return (
    <fieldset>
      <legend className="mb-1.5 text-sm font-medium text-ink">{legend}</legend>
      <div className="inline-flex flex-wrap gap-1 rounded-md border border-line-strong bg-paper-sunk p-1">
        {options.map(([v, label]) => (
          <label
            key={v}
            className={`cursor-pointer rounded px-3 py-1.5 text-sm has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-accent ${
              value === v ? 'bg-paper-raised font-medium text-ink shadow-sm' : 'text-ink-soft hover:text-ink'
            }`}
          >
            <input
              type="radio"
              className="sr-only"
              name={name}
              value={v}
              checked={value === v}
              onChange={() => onChange(v)}
            />
            {label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

export function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-card border border-line bg-paper-raised p-5 shadow-sm">
      <h2 className="mb-4 text-base font-semibold text-ink">{title}</h2>
      <div className="space-y-4">{children}</div>
    </section>
  );
}

export function FieldProblem({ message }: { message?: string }) {
  if (!message) return null;
  return (
    <p role="alert" className="text-xs font-medium text-danger">
      {message}
    </p>
  );
}

/**
 * Below the two-column width the preview sits under the form: this bar keeps its headline figures in
 * view at the bottom of the screen while the form is edited, with a link down to the whole preview.
 */
export function PreviewSummary({
  units,
  data,
  status,
}: {
  units: UnitSystem;
  data: PreviewResponse | undefined;
  status: string;
}) {
  const r = data?.result;
  return (
    <div
      role="region"
      aria-label="Preview summary"
      className="sticky bottom-0 z-20 -mx-1 rounded-t-md border border-line bg-paper-raised/95 px-3 py-2 shadow-lg backdrop-blur xl:hidden"
      data-testid="preview-summary"
    >
      <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
        <span className="text-xs font-medium text-ink-soft">{status}</span>
        {r ? (
          <dl className="figure flex flex-wrap gap-x-4 gap-y-0.5">
            <div className="flex gap-1">
              <dt className="text-ink-soft">NOx above tropopause</dt>
              <dd className="font-semibold text-strato-strong">{formatMass(r.noxAboveTropopauseKg, units)}</dd>
            </div>
            <div className="flex gap-1">
              <dt className="text-ink-soft">Share above</dt>
              <dd className="font-semibold">{formatPercent(r.fractionAboveTropopause, 1)}</dd>
            </div>
            <div className="flex gap-1">
              <dt className="text-ink-soft">Ozone figure</dt>
              <dd className="font-semibold">{formatMass(r.ozoneLoss.centralKg, units)}</dd>
            </div>
          </dl>
        ) : null}
        <a href="#preview" className="ml-auto text-sm font-medium text-accent-strong underline">
          Whole preview
        </a>
      </div>
    </div>
  );
}
