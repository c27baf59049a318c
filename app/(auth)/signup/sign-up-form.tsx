'use client';

import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { signUpAction, type AuthFormState } from '../actions';
import { FormNotice, usePostedForm } from '@/components/ui/use-action-form';
import { NewPasswordField } from '../new-password-field';

/** Posted as an ordinary form (a server action): works before the script loads, and the password never lands in a URL. */
export function SignUpForm({ invitationToken, invitedEmail }: { invitationToken?: string; invitedEmail?: string }) {
  const { state, action, pending, fieldError: err, message } = usePostedForm<AuthFormState>(signUpAction, null);
  const v = state?.values ?? {};
  const k = JSON.stringify(v);
  return (
    <form action={action} noValidate className="mt-5 space-y-4">
      <FormNotice message={message} />
      {invitationToken ? <input type="hidden" name="invitationToken" value={invitationToken} /> : null}
      <Field id="name" label="Your name" error={err('name')}>
        <TextInput
          id="name"
          name="name"
          autoComplete="name"
          required
          invalid={!!err('name')}
          defaultValue={v.name ?? ''}
          key={`n${k}`}
        />
      </Field>
      <Field id="email" label="Work e-mail" error={err('email')}>
        <TextInput
          id="email"
          name="email"
          type="email"
          autoComplete="email"
          required
          readOnly={!!invitedEmail}
          invalid={!!err('email')}
          defaultValue={invitedEmail ?? v.email ?? ''}
          key={`e${k}`}
        />
      </Field>
      <NewPasswordField label="Password" error={err('password')} />
      {invitationToken ? null : (
        <Field
          id="workspaceName"
          label="First workspace (optional)"
          hint="Your operator or client name. You can create more later."
          error={err('workspaceName')}
        >
          <TextInput
            id="workspaceName"
            name="workspaceName"
            invalid={!!err('workspaceName')}
            defaultValue={v.workspaceName ?? ''}
            key={`w${k}`}
          />
        </Field>
      )}
      <Button type="submit" className="w-full" disabled={pending}>
        {pending ? 'Creating…' : invitationToken ? 'Create account and join' : 'Create account'}
      </Button>
    </form>
  );
}
