'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { emailOnlySchema, resetPasswordSchema, type ResetPasswordInput } from '@/lib/validation/auth';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';
import { requestPasswordResetAction, resetPasswordAction } from '../actions';

export function RequestResetForm() {
  const [done, setDone] = useState<string>();
  const [message, setMessage] = useState<string>();
  const form = useForm<{ email: string }>({ resolver: zodResolver(emailOnlySchema), defaultValues: { email: '' } });
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await requestPasswordResetAction(values);
    if (state?.ok) setDone(state.message);
    else setMessage(applyServerErrors(state, form.setError, ['email']));
  });
  if (done) return <Notice tone="success" title="Check your e-mail">{done}</Notice>;
  return (
    <form onSubmit={onSubmit} noValidate className="mt-5 space-y-4">
      {message ? <Notice tone="danger" role="alert">{message}</Notice> : null}
      <Field id="email" label="E-mail" error={form.formState.errors.email?.message}>
        <TextInput id="email" type="email" autoComplete="email" invalid={!!form.formState.errors.email} {...form.register('email')} />
      </Field>
      <Button type="submit" className="w-full" disabled={form.formState.isSubmitting}>
        Send the reset link
      </Button>
    </form>
  );
}

export function NewPasswordForm({ token }: { token: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<string>();
  const form = useForm<ResetPasswordInput>({ resolver: zodResolver(resetPasswordSchema), defaultValues: { token, password: '', confirm: '' } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await resetPasswordAction(values);
    if (state?.ok) router.push('/signin?reset=1');
    else setMessage(applyServerErrors(state, form.setError, ['password', 'confirm']));
  });
  return (
    <form onSubmit={onSubmit} noValidate className="mt-5 space-y-4">
      {message ? <Notice tone="danger" role="alert">{message}</Notice> : null}
      <input type="hidden" {...form.register('token')} />
      <Field id="password" label="New password" hint="At least 10 characters." error={errors.password?.message}>
        <TextInput id="password" type="password" autoComplete="new-password" invalid={!!errors.password} {...form.register('password')} />
      </Field>
      <Field id="confirm" label="Repeat it" error={errors.confirm?.message}>
        <TextInput id="confirm" type="password" autoComplete="new-password" invalid={!!errors.confirm} {...form.register('confirm')} />
      </Field>
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        Set the new password
      </Button>
    </form>
  );
}
