'use client';

import { useTransition } from 'react';
import type { ActionState } from '@/lib/errors';
import { API_KEY_ROLES, ROLE_LABELS } from '@/lib/auth/policy';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { FormNotice, usePostedForm } from '@/components/ui/use-action-form';
import { createApiKeyFormAction, revokeApiKeyAction } from './actions';

/** Posted as an ordinary form (a server action): works before the script loads, and the key never reaches a URL. */
export function CreateKeyForm({ slug }: { slug: string }) {
  const { state, action, pending, fieldError, message } = usePostedForm<ActionState<{ key: string; name: string }>>(
    createApiKeyFormAction,
    null,
  );
  const created = state?.ok ? state.data : undefined;
  return (
    <div className="space-y-4">
      {created ? (
        <Notice tone="success" title={`Key “${created.name}” created`}>
          <p>Copy it now; it will not be shown again.</p>
          <code
            className="mt-2 block break-all rounded bg-paper-raised p-2 font-mono text-xs"
            data-testid="new-api-key"
          >
            {created.key}
          </code>
        </Notice>
      ) : null}
      <FormNotice message={message} />
      <form action={action} noValidate className="space-y-4" key={created?.key ?? 'form'}>
        <input type="hidden" name="slug" value={slug} />
        <Field id="key-name" label="Name" hint="What will use it, e.g. “dispatch system”." error={fieldError('name')}>
          <TextInput id="key-name" name="name" required maxLength={80} invalid={!!fieldError('name')} />
        </Field>
        <Field id="key-role" label="Role" error={fieldError('role')}>
          <SelectInput id="key-role" name="role" defaultValue="planner">
            {API_KEY_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </SelectInput>
        </Field>
        <Button type="submit" disabled={pending}>
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
        if (confirm(`Revoke “${name}”? Anything using it stops working at once.`))
          start(async () => void (await revokeApiKeyAction(slug, { id })));
      }}
    >
      Revoke
    </Button>
  );
}
