'use client';

import { useState, useTransition } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { apiKeyCreateSchema, type ApiKeyCreateInput } from '@/lib/validation/workspaces';
import { API_KEY_ROLES, ROLE_LABELS } from '@/lib/auth/policy';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';
import { createApiKeyAction, revokeApiKeyAction } from './actions';

export function CreateKeyForm({ slug }: { slug: string }) {
  const [created, setCreated] = useState<{ key: string; name: string }>();
  const [message, setMessage] = useState<string>();
  const form = useForm<{ name: string; role?: ApiKeyCreateInput['role'] }, unknown, ApiKeyCreateInput>({
    resolver: zodResolver(apiKeyCreateSchema),
    defaultValues: { name: '', role: 'planner' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await createApiKeyAction(slug, values);
    if (state?.ok && state.data) {
      setCreated(state.data);
      form.reset({ name: '', role: values.role });
    } else setMessage(applyServerErrors(state, form.setError, ['name', 'role']));
  });
  return (
    <div className="space-y-4">
      {created ? (
        <Notice tone="success" title={`Key “${created.name}” created`}>
          <p>Copy it now; it will not be shown again.</p>
          <code className="mt-2 block break-all rounded bg-paper-raised p-2 font-mono text-xs" data-testid="new-api-key">
            {created.key}
          </code>
        </Notice>
      ) : null}
      {message ? <Notice tone="danger" role="alert">{message}</Notice> : null}
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <Field id="key-name" label="Name" hint="What will use it, e.g. “dispatch system”." error={errors.name?.message}>
          <TextInput id="key-name" invalid={!!errors.name} {...form.register('name')} />
        </Field>
        <Field id="key-role" label="Role" error={errors.role?.message}>
          <SelectInput id="key-role" {...form.register('role')}>
            {API_KEY_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </SelectInput>
        </Field>
        <Button type="submit" disabled={isSubmitting}>
          Create key
        </Button>
      </form>
    </div>
  );
}

export function RevokeKeyButton({ slug, id, name }: { slug: string; id: number; name: string }) {
  const [pending, start] = useTransition();
  return (
    <Button
      variant="ghost"
      disabled={pending}
      onClick={() => {
        if (confirm(`Revoke “${name}”? Anything using it stops working at once.`)) start(async () => void (await revokeApiKeyAction(slug, { id })));
      }}
    >
      Revoke
    </Button>
  );
}
