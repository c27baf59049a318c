'use client';

import { useState, useTransition } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { acceptInvitationAction } from './actions';

export function AcceptInvitationButton({ token }: { token: string }) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<string>();
  return (
    <div className="space-y-3">
      {message ? <Notice tone="danger" role="alert">{message}</Notice> : null}
      <Button
        disabled={pending}
        onClick={() =>
          start(async () => {
            const state = await acceptInvitationAction(token);
            if (state?.ok && state.data) window.location.assign(state.data.next);
            else if (state && !state.ok) setMessage(state.error.message);
          })
        }
      >
        Accept and open the workspace
      </Button>
    </div>
  );
}
