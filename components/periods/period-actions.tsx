'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import type { ActionState } from '@/lib/errors';
import { Button } from '@/components/ui/button';
import { Field, TextArea } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';

type Action = (slug: string, raw: unknown) => Promise<ActionState<unknown>>;

interface Props {
  slug: string;
  period: string;
  state: 'open' | 'review' | 'signed';
  hash: string | null;
  can: { review: boolean; sign: boolean; reopen: boolean };
  actions: { review: Action; sign: Action; reopen: Action };
}

/** Review (freeze), sign and reopen, each offered only in the state and to the roles it applies to. */
export function PeriodActions({ slug, period, state, hash, can, actions }: Props) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<{ tone: 'success' | 'danger'; text: string }>();
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string>();

  const run = (action: Action, input: Record<string, unknown>) =>
    start(async () => {
      setMessage(undefined);
      setReasonError(undefined);
      const res = await action(slug, { period, ...input });
      if (res?.ok) {
        setMessage({ tone: 'success', text: res.message ?? 'Done.' });
        setReason('');
        router.refresh();
        return;
      }
      if (!res) return;
      const field = res.error.fields?.find((f) => f.path === 'reason');
      if (field) setReasonError(field.message);
      else setMessage({ tone: 'danger', text: res.error.message });
    });

  const offers =
    (state === 'open' && can.review) || (state === 'review' && can.sign) || (state !== 'open' && can.reopen);
  // The message stays after the state moves on (a review leaves an analyst nothing more to do).
  if (!offers && !message) return null;
  return (
    <div className="space-y-4">
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      {state === 'open' && can.review ? (
        <div>
          <p className="mb-2 text-sm text-ink-soft">
            Moving the period to review freezes its flights, figures, engine versions and assumptions. Flights imported
            or screened again later are shown apart until the period is reopened.
          </p>
          <Button disabled={pending} onClick={() => run(actions.review, {})}>
            Move to review
          </Button>
        </div>
      ) : null}
      {state === 'review' && can.sign ? (
        <div>
          <p className="mb-2 text-sm text-ink-soft">
            Signing records your name, the time and the SHA-256 of the frozen figures. The signed report cannot change.
          </p>
          <Button disabled={pending} onClick={() => run(actions.sign, hash ? { hash } : {})}>
            Sign the period
          </Button>
        </div>
      ) : null}
      {state !== 'open' && can.reopen ? (
        <div className="border-t border-line pt-4">
          <Field
            id="reopen-reason"
            label="Reason for reopening"
            error={reasonError}
            hint="Recorded in the audit log with the sign-off it replaces."
          >
            <TextArea
              id="reopen-reason"
              rows={2}
              value={reason}
              invalid={!!reasonError}
              onChange={(e) => setReason(e.target.value)}
            />
          </Field>
          <Button
            variant="secondary"
            className="mt-2"
            disabled={pending}
            onClick={() => run(actions.reopen, { reason })}
          >
            Reopen the period
          </Button>
        </div>
      ) : null}
    </div>
  );
}
