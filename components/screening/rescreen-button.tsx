'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import type { ActionState } from '@/lib/errors';

/** Screens the saved input again with the current engine and opens the new screening. */
export function RescreenButton({
  slug,
  onRescreen,
}: {
  slug: string;
  onRescreen: () => Promise<ActionState<{ id: number }>>;
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [error, setError] = useState<string>();
  return (
    <div className="mt-2">
      <Button
        variant="secondary"
        disabled={pending}
        onClick={() =>
          start(async () => {
            setError(undefined);
            const state = await onRescreen();
            if (state?.ok && state.data) router.push(`/w/${slug}/screenings/${state.data.id}`);
            else if (state && !state.ok) setError(state.error.message);
          })
        }
      >
        {pending ? 'Screening again…' : 'Screen again with the current method'}
      </Button>
      {error ? (
        <p role="alert" className="mt-2 text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
