'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import { signUpSchema, type SignUpInput } from '@/lib/validation/auth';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';
import { signUpAction } from '../actions';

type FormValues = { name: string; email: string; password: string; workspaceName?: string };

export function SignUpForm({ invitationToken, invitedEmail }: { invitationToken?: string; invitedEmail?: string }) {
  const [message, setMessage] = useState<string>();
  const form = useForm<FormValues, unknown, SignUpInput>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { name: '', email: invitedEmail ?? '', password: '', workspaceName: '' },
  });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await signUpAction(values, invitationToken);
    if (!state?.ok) {
      setMessage(applyServerErrors(state, form.setError, ['name', 'email', 'password', 'workspaceName']));
      return;
    }
    const next = state.data?.next ?? '/workspaces';
    const res = await signIn('credentials', { email: values.email, password: values.password, redirect: false, callbackUrl: next });
    window.location.assign(res?.ok ? next : '/signin');
  });

  return (
    <form onSubmit={onSubmit} noValidate className="mt-5 space-y-4">
      {message ? (
        <Notice tone="danger" role="alert">
          {message}
        </Notice>
      ) : null}
      <Field id="name" label="Your name" error={errors.name?.message}>
        <TextInput id="name" autoComplete="name" invalid={!!errors.name} {...form.register('name')} />
      </Field>
      <Field id="email" label="Work e-mail" error={errors.email?.message}>
        <TextInput id="email" type="email" autoComplete="email" readOnly={!!invitedEmail} invalid={!!errors.email} {...form.register('email')} />
      </Field>
      <Field id="password" label="Password" hint="At least 10 characters." error={errors.password?.message}>
        <TextInput id="password" type="password" autoComplete="new-password" invalid={!!errors.password} {...form.register('password')} />
      </Field>
      {invitationToken ? null : (
        <Field id="workspaceName" label="First workspace (optional)" hint="Your operator or client name. You can create more later." error={errors.workspaceName?.message}>
          <TextInput id="workspaceName" invalid={!!errors.workspaceName} {...form.register('workspaceName')} />
        </Field>
      )}
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? 'Creating…' : invitationToken ? 'Create account and join' : 'Create account'}
      </Button>
    </form>
  );
}
