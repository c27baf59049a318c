'use client';

import { useQuery } from '@tanstack/react-query';
import type { UsageSummary } from '@/lib/billing/usage-summary';
import { Stat } from '@/components/ui/card';
import { formatDate, formatDateTime, formatMoney, formatNumber } from '@/lib/format';
import { COUNT_HINTS, COUNT_LABELS } from '@/lib/counts';

const POLL_MS = 5_000;

async function fetchUsage(slug: string): Promise<UsageSummary> {
  const res = await fetch(`/api/v1/workspaces/${encodeURIComponent(slug)}/usage`, {
    headers: { accept: 'application/json' },
  });
  if (!res.ok) throw new Error(`usage ${res.status}`);
  return (await res.json()) as UsageSummary;
}

/** "2026-12-01 22:57–23:04 UTC": the payment service counts usage in whole minutes. */
function minutesWindow(startIso: string, endIso: string): string {
  const start = formatDateTime(startIso).replace(' UTC', '');
  const end = formatDateTime(endIso).replace(' UTC', '');
  return start.slice(0, 10) === end.slice(0, 10) ? `${start}–${end.slice(11)} UTC` : `${start} – ${end} UTC`;
}

function plural(n: number, one: string, many: string): string {
  return `${formatNumber(n)} ${n === 1 ? one : many}`;
}

function Reconciliation({ usage }: { usage: UsageSummary }) {
  const rec = usage.reconciliation;
  if (usage.status === 'trialing' && usage.sentUnits === 0 && !rec) {
    return (
      <p className="text-sm text-ink-soft">
        Free-trial flights are not sent to the payment service and are never billed.
      </p>
    );
  }
  if (!rec) return <p className="text-sm text-ink-soft">Not checked against the payment service yet.</p>;
  const inFlight = rec.difference > 0 && rec.difference <= usage.pendingUnits;
  const tone = rec.difference === 0 ? 'text-tropo-strong' : inFlight ? 'text-ink-soft' : 'text-caution';
  const verdict =
    rec.difference === 0
      ? 'The ledger and the payment service agree.'
      : inFlight
        ? `${plural(rec.difference, 'flight is', 'flights are')} on the way to the payment service.`
        : `The ledger and the payment service differ by ${plural(Math.abs(rec.difference), 'flight', 'flights')}. This is checked again every few seconds; if it stays, tell support.`;
  return (
    <div className="text-sm" data-testid="reconciliation">
      <p className={`font-medium ${tone}`}>{verdict}</p>
      <p className="figure mt-0.5 text-xs text-ink-faint">
        Ledger {formatNumber(rec.ledgerUnits)} · payment service {formatNumber(rec.providerUnits)} · counted over{' '}
        <span className="whitespace-nowrap">{minutesWindow(rec.windowStart, rec.windowEnd)}</span>
        {Date.parse(rec.windowStart) < Date.parse(usage.periodStart) ? ', from the minute the period began in' : ''} ·
        checked <span className="whitespace-nowrap">{formatDateTime(rec.checkedAt)}</span>
        {usage.providerReachable ? '' : ' (the payment service did not answer just now)'}
      </p>
    </div>
  );
}

/** This period's metered flights and estimated charge, refreshed every few seconds. */
export function UsageMeter({ slug, initial }: { slug: string; initial: UsageSummary }) {
  const { data, isError } = useQuery({
    queryKey: ['usage', slug],
    queryFn: () => fetchUsage(slug),
    initialData: initial,
    refetchInterval: POLL_MS,
  });
  const usage = data;
  const counted = usage.sentUnits;
  const waiting = usage.pendingUnits;
  const total = Math.max(1, counted + waiting);
  const estimateSub = usage.freePeriod
    ? 'free trial: nothing to pay for this period'
    : usage.status === 'canceled'
      ? 'no running subscription'
      : `${formatMoney(usage.baseFeeCents)} base + ${formatNumber(usage.units)} × ${formatMoney(usage.perFlightCents)}`;
  return (
    <div className="space-y-4" aria-live="polite">
      <p className="figure text-sm text-ink-soft">
        Period {formatDate(usage.periodStart)} to {formatDate(usage.periodEnd)}
      </p>
      <div className="grid gap-3 sm:grid-cols-2">
        <Stat
          label={COUNT_LABELS.billableUnits}
          value={<span data-testid="usage-units">{formatNumber(usage.units)}</span>}
          sub={COUNT_HINTS.billableUnits}
        />
        <Stat
          label="Estimated charge"
          value={<span data-testid="usage-estimate">{formatMoney(usage.estimatedChargeCents)}</span>}
          sub={estimateSub}
        />
      </div>
      {usage.units > 0 && !usage.freePeriod ? (
        <div>
          <div
            className="flex h-2.5 overflow-hidden rounded-full bg-paper-sunk"
            role="img"
            aria-label={`${counted} of ${counted + waiting} flights counted by the payment service`}
          >
            <div className="bg-accent" style={{ width: `${(counted / total) * 100}%` }} />
            <div className="bg-accent/30" style={{ width: `${(waiting / total) * 100}%` }} />
          </div>
          <p className="figure mt-1 text-xs text-ink-soft">
            {plural(counted, 'flight', 'flights')} counted by the payment service
            {waiting > 0 ? `, ${formatNumber(waiting)} waiting to be sent` : ''}
            {usage.retryingUnits > 0
              ? ` (${formatNumber(usage.retryingUnits)} being retried after the service did not answer)`
              : ''}
          </p>
        </div>
      ) : null}
      <Reconciliation usage={usage} />
      <p className="text-xs text-ink-faint">
        An estimate before any tax; the invoice issued when the period closes is the amount charged.
      </p>
      {isError ? <p className="text-xs text-caution">Could not refresh just now; showing the last figures.</p> : null}
    </div>
  );
}
