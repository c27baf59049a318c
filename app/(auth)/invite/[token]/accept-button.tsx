'use client';

import { Button } from '@/components/ui/button';
import { FormNotice, usePostedForm } from '@/components/ui/use-action-form';
import type { ActionState } from '@/lib/errors';
import { acceptInvitationFormAction } from './actions';

export function AcceptInvitationButton({ token }: { token: string }) {
  const { state, action, pending } = usePostedForm<ActionState>(acceptInvitationFormAction, null);
  return (
    <form action={action} className="space-y-3">
      <FormNotice message={state && !state.ok ? state.error.message : undefined} />
      <input type="hidden" name="token" value={token} />
      <Button type="submit" disabled={pending}>
        Accept and open the workspace
      </Button>
    </form>
  );
}
