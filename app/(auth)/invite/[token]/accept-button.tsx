'use client';

import { useActionState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import type { ActionState } from '@/lib/errors';
import { acceptInvitationFormAction } from './actions';

export function AcceptInvitationButton({ token }: { token: string }) {
  const [state, action, pending] = useActionState<ActionState, FormData>(acceptInvitationFormAction, null);
  return (
    <form action={action} className="space-y-3">
      {state && !state.ok ? (
        <Notice tone="danger" role="alert">
          {state.error.message}
        </Notice>
      ) : null}
      <input type="hidden" name="token" value={token} />
      <Button type="submit" disabled={pending}>
        Accept and open the workspace
      </Button>
    </form>
  );
}
