'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import type { ActionState } from '@/lib/errors';
import { Button } from '@/components/ui/button';
import { Field, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';

interface Props {
  slug: string;
  action: (slug: string, raw: unknown) => Promise<ActionState<{ ref: string }>>;
}

/** A custom reporting period: a name and its first and last day. */
export function CustomPeriodForm({ slug, action }: Props) {
  const router = useRouter();
  const [values, setValues] = useState({ name: '', from: '', to: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string>();
  const [pending, start] = useTransition();
  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    start(async () => {
      setErrors({});
      setMessage(undefined);
      const res = await action(slug, values);
      if (res?.ok && res.data) {
        router.push(`/w/${slug}/periods/${res.data.ref}`);
        return;
      }
      if (!res || res.ok) return;
      setErrors(Object.fromEntries((res.error.fields ?? []).map((f) => [f.path, f.message])));
      if (!res.error.fields?.length) setMessage(res.error.message);
    });
  };
  return (
    <form onSubmit={submit} noValidate className="grid gap-3 sm:grid-cols-[2fr_1fr_1fr_auto] sm:items-end">
      {message ? (
        <div className="sm:col-span-4">
          <Notice tone="danger" role="alert">
            {message}
          </Notice>
        </div>
      ) : null}
      <Field id="period-name" label="Name" error={errors.name}>
        <TextInput
          id="period-name"
          value={values.name}
          invalid={!!errors.name}
          onChange={(e) => setValues({ ...values, name: e.target.value })}
        />
      </Field>
      <Field id="period-from" label="From" error={errors.from}>
        <TextInput
          id="period-from"
          type="date"
          value={values.from}
          invalid={!!errors.from}
          onChange={(e) => setValues({ ...values, from: e.target.value })}
        />
      </Field>
      <Field id="period-to" label="To" error={errors.to}>
        <TextInput
          id="period-to"
          type="date"
          value={values.to}
          invalid={!!errors.to}
          onChange={(e) => setValues({ ...values, to: e.target.value })}
        />
      </Field>
      <Button type="submit" disabled={pending}>
        Create period
      </Button>
    </form>
  );
}
