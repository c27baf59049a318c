'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { workspaceCreateSchema, type WorkspaceCreateInput } from '@/lib/validation/workspaces';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';
import { createWorkspaceAction } from './actions';

export function CreateWorkspaceForm() {
  const router = useRouter();
  const [message, setMessage] = useState<string>();
  const form = useForm<{ name: string; slug?: string }, unknown, WorkspaceCreateInput>({
    resolver: zodResolver(workspaceCreateSchema),
    defaultValues: { name: '', slug: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await createWorkspaceAction(values);
    if (state?.ok && state.data) router.push(`/w/${state.data.slug}`);
    else setMessage(applyServerErrors(state, form.setError, ['name', 'slug']));
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {message ? (
        <Notice tone="danger" role="alert">
          {message}
        </Notice>
      ) : null}
      <Field id="ws-name" label="Name" error={errors.name?.message}>
        <TextInput id="ws-name" invalid={!!errors.name} {...form.register('name')} />
      </Field>
      <Field
        id="ws-slug"
        label="Address (optional)"
        hint="Shown in links: /w/your-address. Made from the name when empty."
        error={errors.slug?.message}
      >
        <TextInput id="ws-slug" invalid={!!errors.slug} {...form.register('slug')} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        Create workspace
      </Button>
    </form>
  );
}
