'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import type { ActionState } from '@/lib/errors';
import { TARGET_METRICS, TARGET_METRIC_LABELS, type TargetMetric } from '@/lib/validation/periods';
import { Button } from '@/components/ui/button';
import { SelectInput, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';

interface Row {
  fleetId: string;
  metric: TargetMetric;
  value: string;
}

interface Props {
  slug: string;
  period: string;
  fleets: { id: number; name: string }[];
  initial: { fleetId: number | null; metric: TargetMetric; target: number }[];
  action: (slug: string, raw: unknown) => Promise<ActionState<unknown>>;
}

/** The period's targets as editable rows; saving replaces the whole set. */
export function TargetsForm({ slug, period, fleets, initial, action }: Props) {
  const router = useRouter();
  const [rows, setRows] = useState<Row[]>(
    initial.map((t) => ({
      fleetId: t.fleetId === null ? '' : String(t.fleetId),
      metric: t.metric,
      value: String(t.target),
    })),
  );
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<{ tone: 'success' | 'danger'; text: string }>();
  const [errors, setErrors] = useState<Record<string, string>>({});

  const update = (i: number, patch: Partial<Row>) =>
    setRows((rs) => rs.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const save = () =>
    start(async () => {
      setMessage(undefined);
      setErrors({});
      const res = await action(slug, {
        period,
        targets: rows.map((r) => ({
          fleetId: r.fleetId === '' ? null : Number(r.fleetId),
          metric: r.metric,
          value: r.value.trim() === '' ? Number.NaN : Number(r.value),
        })),
      });
      if (res?.ok) {
        setMessage({ tone: 'success', text: res.message ?? 'Saved.' });
        router.refresh();
        return;
      }
      if (!res) return;
      const fields = res.error.fields ?? [];
      setErrors(Object.fromEntries(fields.map((f) => [f.path, f.message])));
      setMessage({ tone: 'danger', text: fields.length ? 'Some targets need attention.' : res.error.message });
    });

  return (
    <div className="space-y-3">
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      {rows.length === 0 ? <p className="text-sm text-ink-soft">No targets yet.</p> : null}
      {rows.map((r, i) => (
        <div key={i} className="flex flex-wrap items-start gap-2" data-testid="target-row">
          <label className="sr-only" htmlFor={`target-fleet-${i}`}>
            Fleet of target {i + 1}
          </label>
          <SelectInput
            id={`target-fleet-${i}`}
            value={r.fleetId}
            onChange={(e) => update(i, { fleetId: e.target.value })}
          >
            <option value="">All fleets</option>
            {fleets.map((f) => (
              <option key={f.id} value={String(f.id)}>
                {f.name}
              </option>
            ))}
          </SelectInput>
          <label className="sr-only" htmlFor={`target-metric-${i}`}>
            Measure of target {i + 1}
          </label>
          <SelectInput
            id={`target-metric-${i}`}
            value={r.metric}
            onChange={(e) => update(i, { metric: e.target.value as TargetMetric })}
          >
            {TARGET_METRICS.map((m) => (
              <option key={m} value={m}>
                {TARGET_METRIC_LABELS[m].label} ({TARGET_METRIC_LABELS[m].unit})
              </option>
            ))}
          </SelectInput>
          <div>
            <label className="sr-only" htmlFor={`target-value-${i}`}>
              Value of target {i + 1} ({TARGET_METRIC_LABELS[r.metric].unit})
            </label>
            <div className="flex items-center gap-2">
              <TextInput
                id={`target-value-${i}`}
                inputMode="decimal"
                aria-describedby={undefined}
                className="w-28"
                value={r.value}
                invalid={!!errors[`targets.${i}.value`]}
                onChange={(e) => update(i, { value: e.target.value })}
              />
              <span className="text-sm text-ink-soft" data-testid="target-unit">
                {TARGET_METRIC_LABELS[r.metric].unit}
              </span>
            </div>
            {errors[`targets.${i}.value`] || errors[`targets.${i}.metric`] || errors[`targets.${i}.fleetId`] ? (
              <p className="mt-1 text-xs text-danger">
                {errors[`targets.${i}.value`] ?? errors[`targets.${i}.metric`] ?? errors[`targets.${i}.fleetId`]}
              </p>
            ) : null}
          </div>
          <Button variant="ghost" onClick={() => setRows((rs) => rs.filter((_, j) => j !== i))}>
            Remove
          </Button>
        </div>
      ))}
      <div className="flex gap-2">
        <Button
          variant="secondary"
          onClick={() => setRows((rs) => [...rs, { fleetId: '', metric: 'noxAboveT', value: '' }])}
        >
          Add a target
        </Button>
        <Button disabled={pending} onClick={save}>
          Save targets
        </Button>
      </div>
    </div>
  );
}
