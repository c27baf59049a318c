import type { ActionState } from '@/lib/errors';
import { formatDateTime, formatNumber } from '@/lib/format';
import type { PeriodView } from '@/lib/periods/service';
import { Card } from '@/components/ui/card';
import { PeriodActions } from './period-actions';
import { StateBadge } from './state-badge';

type Action = (slug: string, raw: unknown) => Promise<ActionState<unknown>>;

interface Props {
  slug: string;
  view: Pick<PeriodView, 'period' | 'snapshot'>;
  can: { review: boolean; sign: boolean; reopen: boolean };
  actions: { review: Action; sign: Action; reopen: Action };
  /** Who takes the next step, for a member who cannot (components/periods/next-step.ts). */
  nextStepNote?: string | null;
}

/** Who froze and signed the period, the hash of its frozen flights, and the review, sign and reopen steps. */
export function PeriodSignOffCard({ slug, view, can, actions, nextStepNote }: Props) {
  const p = view.period;
  return (
    <Card title="Review and sign-off">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-soft">State</dt>
        <dd>
          <StateBadge state={p.state} />
        </dd>
        <dt className="text-ink-soft">Frozen</dt>
        <dd>{p.frozenAt ? `${formatDateTime(p.frozenAt)} by ${p.frozenBy}` : '–'}</dd>
        <dt className="text-ink-soft">Signed</dt>
        <dd data-testid="signed-by">{p.signedAt ? `${formatDateTime(p.signedAt)} by ${p.signedBy}` : '–'}</dd>
        <dt className="text-ink-soft">SHA-256</dt>
        <dd className="break-all font-mono text-xs" data-testid="sign-hash">
          {p.signHash ?? view.snapshot?.csvSha256 ?? '–'}
        </dd>
      </dl>
      {view.snapshot ? (
        <p className="mt-2 text-xs text-ink-faint">
          The hash of the audit CSV of the {formatNumber(view.snapshot.flights)} frozen flights (engine{' '}
          {view.snapshot.engineVersions.map((v) => v.engineVersion).join(', ') || '–'}); it recomputes from flights.csv
          in the audit pack.
        </p>
      ) : null}
      <div className="mt-4">
        <PeriodActions
          slug={slug}
          period={p.ref}
          state={p.state}
          hash={view.snapshot?.csvSha256 ?? null}
          can={can}
          actions={actions}
        />
        {nextStepNote ? (
          <p className="mt-3 text-sm text-ink-soft" data-testid="period-next-step">
            {nextStepNote}
          </p>
        ) : null}
      </div>
    </Card>
  );
}
