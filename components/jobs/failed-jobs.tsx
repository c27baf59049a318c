'use client';

import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import type { ActionState } from '@/lib/errors';
import { formatDateTime, formatNumber } from '@/lib/format';
import { Button } from '@/components/ui/button';
import { TableHead } from '@/components/ui/table-head';

export interface FailedJobRow {
  id: number;
  label: string;
  reason: string;
  attempts: number;
  failedAt: string;
}

/** The workspace's failed background jobs (owners), each with its reason and a retry button. */
export function FailedJobs({ jobs, onRetry }: { jobs: FailedJobRow[]; onRetry: (id: number) => Promise<ActionState> }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  const notice = message ? (
    <p role={message.ok ? 'status' : 'alert'} className={`mt-2 text-sm ${message.ok ? 'text-ink' : 'text-danger'}`}>
      {message.text}
    </p>
  ) : null;
  if (jobs.length === 0)
    return (
      <div data-testid="failed-jobs-empty">
        <p className="text-sm text-ink-soft">
          No failed background jobs. A job that fails is retried with growing pauses; one that still fails shows here
          with its reason.
        </p>
        {notice}
      </div>
    );
  return (
    <div data-testid="failed-jobs">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Failed background jobs</caption>
        <TableHead
          className=""
          rowClassName="text-xs text-ink-soft"
          pad="py-1"
          cellClassName="font-medium"
          columns={[
            'Job',
            'Reason',
            'Failed',
            { label: 'Attempts', right: true },
            { label: <span className="sr-only">Retry</span> },
          ]}
        />
        <tbody>
          {jobs.map((j) => (
            <tr key={j.id} className="border-t border-line align-top">
              <td className="py-2 pr-3">{j.label}</td>
              <td className="py-2 pr-3 text-ink-soft">{j.reason}</td>
              <td className="py-2 pr-3 whitespace-nowrap">{formatDateTime(j.failedAt)}</td>
              <td className="py-2 pr-3 text-right tabular-nums">{formatNumber(j.attempts)}</td>
              <td className="py-2 text-right">
                <Button
                  variant="secondary"
                  disabled={pending}
                  aria-label={`Retry: ${j.label}`}
                  onClick={() =>
                    start(async () => {
                      const state = await onRetry(j.id);
                      if (state?.ok) setMessage({ ok: true, text: state.message ?? 'Queued again.' });
                      else if (state) setMessage({ ok: false, text: state.error.message });
                      router.refresh();
                    })
                  }
                >
                  Retry
                </Button>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {notice}
    </div>
  );
}
