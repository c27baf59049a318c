'use client';

import { useRouter } from 'next/navigation';
import { zodResolver } from '@hookform/resolvers/zod';
import { workspaceCreateSchema, type WorkspaceCreateInput } from '@/lib/validation/workspaces';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';
import { createWorkspaceAction } from './actions';

export function CreateWorkspaceForm() {
  const router = useRouter();
  const { form, errors, pending, message, onSubmit } = useActionForm<
    { name: string; slug?: string },
    WorkspaceCreateInput,
    { slug: string }
  >({
    resolver: zodResolver(workspaceCreateSchema),
    defaultValues: { name: '', slug: '' },
    fields: ['name', 'slug'],
    action: createWorkspaceAction,
    onSuccess: (state) => {
      if (state.data) router.push(`/w/${state.data.slug}`);
    },
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
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
      <Button type="submit" disabled={pending}>
        Create workspace
      </Button>
    </form>
  );
}
