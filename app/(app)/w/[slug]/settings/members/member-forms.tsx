'use client';

import { useState, useTransition } from 'react';
import { zodResolver } from '@hookform/resolvers/zod';
import { invitationCreateSchema } from '@/lib/validation/workspaces';
import { ROLES, ROLE_LABELS, type Role } from '@/lib/auth/policy';
import type { MemberDto } from '@/db/workspaces';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { FormNotice, useActionForm } from '@/components/ui/use-action-form';
import { changeRoleAction, inviteMemberAction, removeMemberAction, revokeInvitationAction } from './actions';

export function InviteForm({ slug }: { slug: string }) {
  const {
    form,
    errors,
    pending: isSubmitting,
    message,
    onSubmit,
  } = useActionForm<{ email: string; role: Role }, { email: string; role: Role }, unknown>({
    resolver: zodResolver(invitationCreateSchema),
    defaultValues: { email: '', role: 'planner' },
    fields: ['email', 'role'],
    action: (values: { email: string; role: Role }) => inviteMemberAction(slug, values),
    onSuccess: (state, values) => {
      form.reset({ email: '', role: values.role });
      return state.message ?? 'Invitation sent.';
    },
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <Field id="invite-email" label="E-mail" error={errors.email?.message}>
        <TextInput id="invite-email" type="email" invalid={!!errors.email} {...form.register('email')} />
      </Field>
      <Field id="invite-role" label="Role" error={errors.role?.message}>
        <SelectInput id="invite-role" {...form.register('role')}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </SelectInput>
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        Send invitation
      </Button>
    </form>
  );
}

export function MemberRow({ slug, member, isSelf }: { slug: string; member: MemberDto; isSelf: boolean }) {
  const [pending, start] = useTransition();
  const [error, setError] = useState<string>();
  const run = (fn: () => Promise<{ ok: boolean; error?: { message: string } } | null>) =>
    start(async () => {
      setError(undefined);
      const state = await fn();
      if (state && !state.ok) setError(state.error?.message);
    });
  return (
    <tr className="border-t border-line align-top">
      <td className="py-2">
        {member.name || member.email}
        {isSelf ? <span className="ml-1 text-xs text-ink-faint">(you)</span> : null}
        <div className="text-xs text-ink-faint">{member.email}</div>
        {error ? (
          <p role="alert" className="mt-1 text-xs text-danger">
            {error}
          </p>
        ) : null}
      </td>
      <td className="py-2">
        <label className="sr-only" htmlFor={`role-${member.userId}`}>
          Role of {member.email}
        </label>
        <select
          id={`role-${member.userId}`}
          defaultValue={member.role}
          disabled={pending}
          onChange={(e) => run(() => changeRoleAction(slug, { userId: member.userId, role: e.target.value }))}
          className="rounded-md border border-line-strong bg-paper-raised px-2 py-1 text-sm"
        >
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
      </td>
      <td className="py-2 text-ink-soft">{member.joinedAt.slice(0, 10)}</td>
      <td className="py-2 text-right">
        <Button
          variant="ghost"
          disabled={pending}
          onClick={() => {
            if (confirm(`Remove ${member.email} from this workspace?`))
              run(() => removeMemberAction(slug, { id: member.userId }));
          }}
        >
          Remove
        </Button>
      </td>
    </tr>
  );
}

export function RevokeInvitationButton({ slug, id }: { slug: string; id: number }) {
  const [pending, start] = useTransition();
  return (
    <Button
      variant="ghost"
      disabled={pending}
      onClick={() => start(async () => void (await revokeInvitationAction(slug, { id })))}
    >
      Withdraw
    </Button>
  );
}
