'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import { emailOnlySchema } from '@/lib/validation/auth';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { signInWithPasswordAction, type AuthFormState } from '../actions';
import { FormNotice, usePostedForm } from '@/components/ui/use-action-form';

/**
 * The password form is a server action posted as an ordinary form: before the script has loaded (a slow
 * phone) or without script it still posts, and the password never lands in a URL.
 */
export function SignInForm({ callbackUrl, initialNotice }: { callbackUrl: string; initialNotice?: string }) {
  const router = useRouter();
  const [mode, setMode] = useState<'password' | 'link'>('password');
  const [message, setMessage] = useState<string | undefined>(initialNotice);
  const {
    state,
    action,
    pending,
    fieldError,
    message: stateMessage,
  } = usePostedForm<AuthFormState>(signInWithPasswordAction, null);
  const linkForm = useForm<{ email: string }>({ resolver: zodResolver(emailOnlySchema), defaultValues: { email: '' } });

  const submitLink = linkForm.handleSubmit(async (values) => {
    setMessage(undefined);
    const res = await signIn('email', {
      email: values.email,
      redirect: false,
      callbackUrl: `/start?next=${encodeURIComponent(callbackUrl)}`,
    });
    if (res?.error) {
      setMessage(res.error === 'EmailSignin' ? 'The sign-in link could not be sent. Try again shortly.' : res.error);
      return;
    }
    router.push('/signin/check-email');
  });

  const emailError = fieldError('email');
  const passwordError = fieldError('password');
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
      {message && !state ? (
        <Notice tone="danger" role="alert">
          {message}
        </Notice>
      ) : null}
      {mode === 'password' ? (
        <form action={action} noValidate className="space-y-4">
          <FormNotice message={stateMessage} />
          <input type="hidden" name="callbackUrl" value={callbackUrl} />
          <Field id="email" label="E-mail" error={emailError}>
            <TextInput
              id="email"
              name="email"
              type="email"
              autoComplete="email"
              required
              invalid={!!emailError}
              defaultValue={state?.values?.email ?? ''}
              key={`email-${state?.values?.email ?? ''}`}
            />
          </Field>
          <Field id="password" label="Password" error={passwordError}>
            <TextInput
              id="password"
              name="password"
              type="password"
              autoComplete="current-password"
              required
              invalid={!!passwordError}
            />
          </Field>
          <Button type="submit" className="w-full" disabled={pending}>
            {pending ? 'Signing in…' : 'Sign in'}
          </Button>
          <p className="text-center text-sm">
            <Link className="text-accent underline" href="/reset">
              Forgot your password?
            </Link>
          </p>
        </form>
      ) : (
        <form method="post" onSubmit={submitLink} noValidate className="space-y-4">
          <Field
            id="link-email"
            label="E-mail"
            hint="We send a link that works once, within 10 minutes."
            error={linkForm.formState.errors.email?.message}
          >
            <TextInput
              id="link-email"
              type="email"
              autoComplete="email"
              invalid={!!linkForm.formState.errors.email}
              {...linkForm.register('email')}
            />
          </Field>
          <Button type="submit" className="w-full" disabled={linkForm.formState.isSubmitting}>
            Send the sign-in link
          </Button>
        </form>
      )}
    </div>
  );
}
