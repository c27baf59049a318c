'use client';

import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { requestPasswordResetAction, resetPasswordAction, type AuthFormState } from '../actions';
import { FormNotice, usePostedForm } from '@/components/ui/use-action-form';
import { NewPasswordField } from '../new-password-field';

export function RequestResetForm() {
  const { state, action, pending, fieldError, message } = usePostedForm<AuthFormState>(
    requestPasswordResetAction,
    null,
  );
  if (state?.ok)
    return (
      <Notice tone="success" title="Check your e-mail">
        {state.message}
      </Notice>
    );
  const err = fieldError('email');
  return (
    <form action={action} noValidate className="mt-5 space-y-4">
      <FormNotice message={message} />
      <Field id="email" label="E-mail" error={err}>
        <TextInput
          id="email"
          name="email"
          type="email"
          autoComplete="email"
          required
          invalid={!!err}
          defaultValue={state?.values?.email ?? ''}
          key={state?.values?.email ?? ''}
        />
      </Field>
      <Button type="submit" className="w-full" disabled={pending}>
        Send the reset link
      </Button>
    </form>
  );
}

/** Posted as an ordinary form (a server action): works before the script loads; the password never lands in a URL. */
export function NewPasswordForm({ token }: { token: string }) {
  const { action, pending, fieldError: err, message } = usePostedForm<AuthFormState>(resetPasswordAction, null);
  return (
    <form action={action} noValidate className="mt-5 space-y-4">
      <FormNotice message={message} />
      <input type="hidden" name="token" value={token} />
      <NewPasswordField label="New password" error={err('password')} />
      <Field id="confirm" label="Repeat it" error={err('confirm')}>
        <TextInput
          id="confirm"
          name="confirm"
          type="password"
          autoComplete="new-password"
          required
          invalid={!!err('confirm')}
        />
      </Field>
      <Button type="submit" className="w-full" disabled={pending}>
        Set the new password
      </Button>
    </form>
  );
}
