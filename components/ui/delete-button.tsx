'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import type { ActionState } from '@/lib/errors';

/**
 * Deletes after a confirmation; shows the server's refusal (such as an engine still in use) right
 * under the button, and goes to `after` when done.
 */
export function DeleteButton({
  action,
  confirmText,
  label = 'Delete',
  after,
}: {
  action: () => Promise<ActionState>;
  confirmText: string;
  label?: string;
  after: string;
}) {
  const [pending, start] = useTransition();
  const [error, setError] = useState<string>();
  const router = useRouter();
  return (
    <div className="space-y-2">
      <Button
        variant="secondary"
        className="border-danger/50 text-danger hover:bg-danger-soft"
        disabled={pending}
        onClick={() => {
          if (!window.confirm(confirmText)) return;
          start(async () => {
            setError(undefined);
            const state = await action();
            if (state && !state.ok) setError(state.error.message);
            else router.push(after);
          });
        }}
      >
        {pending ? 'Deleting…' : label}
      </Button>
      {error ? (
        <p role="alert" className="max-w-md text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
