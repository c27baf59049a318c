'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import { signInSchema, emailOnlySchema, type SignInInput } from '@/lib/validation/auth';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

export function SignInForm({ callbackUrl, initialNotice }: { callbackUrl: string; initialNotice?: string }) {
  const router = useRouter();
  const [mode, setMode] = useState<'password' | 'link'>('password');
  const [message, setMessage] = useState<string | undefined>(initialNotice);
  const form = useForm<SignInInput>({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });
  const linkForm = useForm<{ email: string }>({ resolver: zodResolver(emailOnlySchema), defaultValues: { email: '' } });

  const submitPassword = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const res = await signIn('credentials', { ...values, redirect: false, callbackUrl });
    if (!res || res.error) {
      setMessage(res?.error && res.error !== 'CredentialsSignin' ? res.error : 'That e-mail and password do not match an account.');
      return;
    }
    window.location.assign(callbackUrl);
  });

  const submitLink = linkForm.handleSubmit(async (values) => {
    setMessage(undefined);
    const res = await signIn('email', { email: values.email, redirect: false, callbackUrl });
    if (res?.error) {
      setMessage(res.error === 'EmailSignin' ? 'The sign-in link could not be sent. Try again shortly.' : res.error);
      return;
    }
    router.push('/signin/check-email');
  });

  return (
    <div className="mt-5 space-y-4">
      <div role="tablist" aria-label="How to sign in" className="flex gap-1 rounded-md bg-paper-sunk p-1 text-sm">
        {(['password', 'link'] as const).map((m) => (
          <button
            key={m}
            role="tab"
            type="button"
            aria-selected={mode === m}
            onClick={() => setMode(m)}
            className={`flex-1 rounded px-3 py-1.5 ${mode === m ? 'bg-paper-raised font-medium shadow-sm' : 'text-ink-soft'}`}
          >
            {m === 'password' ? 'Password' : 'E-mail me a link'}
          </button>
        ))}
      </div>
      {message ? (
        <Notice tone="danger" role="alert">
          {message}
        </Notice>
      ) : null}
      {mode === 'password' ? (
        <form onSubmit={submitPassword} noValidate className="space-y-4">
          <Field id="email" label="E-mail" error={form.formState.errors.email?.message}>
            <TextInput id="email" type="email" autoComplete="email" invalid={!!form.formState.errors.email} {...form.register('email')} />
          </Field>
          <Field id="password" label="Password" error={form.formState.errors.password?.message}>
            <TextInput id="password" type="password" autoComplete="current-password" invalid={!!form.formState.errors.password} {...form.register('password')} />
          </Field>
          <Button type="submit" className="w-full" disabled={form.formState.isSubmitting}>
            {form.formState.isSubmitting ? 'Signing in…' : 'Sign in'}
          </Button>
          <p className="text-center text-sm">
            <Link className="text-accent underline" href="/reset">
              Forgot your password?
            </Link>
          </p>
        </form>
      ) : (
        <form onSubmit={submitLink} noValidate className="space-y-4">
          <Field id="link-email" label="E-mail" hint="We send a link that works once, within 10 minutes." error={linkForm.formState.errors.email?.message}>
            <TextInput id="link-email" type="email" autoComplete="email" invalid={!!linkForm.formState.errors.email} {...linkForm.register('email')} />
          </Field>
          <Button type="submit" className="w-full" disabled={linkForm.formState.isSubmitting}>
            Send the sign-in link
          </Button>
        </form>
      )}
    </div>
  );
}
