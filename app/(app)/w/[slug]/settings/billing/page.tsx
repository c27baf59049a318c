import { Suspense } from 'react';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listBillingContacts, type BillingDto } from '@/db/billing';
import { ensureBilling } from '@/lib/billing/trial';
import { getUsageSummary } from '@/lib/billing/usage-summary';
import { cardChoiceForLabel } from '@/lib/billing/cards';
import { PLANS } from '@/lib/billing/plans';
import { Card, PageHeader } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { formatDate, formatMoney } from '@/lib/format';
import {
  BillingEmailForm,
  CancelResume,
  ChangePlanForm,
  PaymentCardForm,
  SubscribeForm,
  UsageBudgetForm,
} from './billing-forms';
import { InvoiceList } from './invoice-list';
import { UsageMeter } from './usage-meter';

export const metadata = { title: 'Billing' };

const STATUS: Record<BillingDto['status'], { label: string; className: string }> = {
  trialing: { label: 'Free trial', className: 'bg-accent-soft text-accent-strong' },
  active: { label: 'Active', className: 'bg-tropo-soft text-tropo-strong' },
  past_due: { label: 'Payment failed', className: 'bg-danger-soft text-danger' },
  canceled: { label: 'Canceled', className: 'bg-paper-sunk text-ink-soft' },
};

const daysUntil = (iso: string) => Math.ceil((Date.parse(iso) - Date.now()) / 86_400_000);

function StatusNotice({ billing }: { billing: BillingDto }) {
  if (billing.status === 'past_due') {
    return (
      <Notice tone="danger" role="alert" title="Payment failed: new screenings and imports are paused">
        The card on file was declined{billing.paymentFailedAt ? ` on ${formatDate(billing.paymentFailedAt)}` : ''}. Put
        a card that works on file, then pay the open invoice below. Everything already saved stays readable.
      </Notice>
    );
  }
  if (billing.status === 'canceled') {
    return (
      <Notice tone="caution" title="No running subscription: new screenings and imports are paused">
        Subscribe below to resume. Saved screenings, flights and reports stay readable.
      </Notice>
    );
  }
  if (billing.status === 'trialing' && billing.trialEndsAt) {
    const left = daysUntil(billing.trialEndsAt);
    if (billing.subscriptionId) {
      return (
        <Notice
          tone="info"
          title={`Subscribed to ${PLANS[billing.planId].name}, free until ${formatDate(billing.trialEndsAt)}`}
        >
          The first paid period starts when the trial ends. Flights screened during the trial are never billed.
        </Notice>
      );
    }
    return left > 0 ? (
      <Notice
        tone="info"
        title={`Free trial: ${left} day${left === 1 ? '' : 's'} left (until ${formatDate(billing.trialEndsAt)})`}
      >
        Subscribe any time to keep screening after the trial; the rest of the trial stays free.
      </Notice>
    ) : (
      <Notice tone="caution" title={`The free trial ended on ${formatDate(billing.trialEndsAt)}`}>
        New screenings and imports are paused until the workspace is subscribed. Everything already saved stays
        readable.
      </Notice>
    );
  }
  if (billing.cancelAtPeriodEnd && billing.currentPeriodEnd) {
    return (
      <Notice tone="caution" title={`The subscription ends on ${formatDate(billing.currentPeriodEnd)}`}>
        Screening continues until then. Resume below to keep the workspace subscribed.
      </Notice>
    );
  }
  return null;
}

function PlanSummary({ billing }: { billing: BillingDto }) {
  const plan = PLANS[billing.planId];
  const status = STATUS[billing.status];
  return (
    <dl className="space-y-3 text-sm">
      <div>
        <dt className="text-xs font-medium uppercase tracking-wide text-ink-soft">Plan</dt>
        <dd className="mt-0.5 flex items-center gap-2">
          <span className="text-lg font-semibold text-ink" data-testid="plan-name">
            {plan.name}
          </span>
          <span className={`rounded px-2 py-0.5 text-xs font-medium ${status.className}`} data-testid="billing-status">
            {status.label}
          </span>
        </dd>
        <dd className="figure mt-0.5 text-ink-soft">
          {formatMoney(plan.baseFeeCents)} a month + {formatMoney(plan.perFlightCents)} per screened flight
        </dd>
      </div>
      <div>
        <dt className="text-xs font-medium uppercase tracking-wide text-ink-soft">
          {billing.status === 'trialing' ? 'Trial ends' : billing.cancelAtPeriodEnd ? 'Ends' : 'Renews'}
        </dt>
        <dd className="figure mt-0.5 text-ink">
          {billing.status === 'trialing'
            ? formatDate(billing.trialEndsAt)
            : billing.status === 'canceled'
              ? '–'
              : formatDate(billing.currentPeriodEnd)}
        </dd>
      </div>
      <div>
        <dt className="text-xs font-medium uppercase tracking-wide text-ink-soft">Card on file</dt>
        <dd className="mt-0.5 text-ink">{billing.paymentMethodLabel ?? 'None yet'}</dd>
      </div>
    </dl>
  );
}

/** Asks the payment service for its count (reconciliation), so it streams in behind a placeholder. */
async function PeriodUsage({ slug, workspaceId }: { slug: string; workspaceId: number }) {
  const usage = await getUsageSummary({ workspaceId });
  return <UsageMeter slug={slug} initial={usage} />;
}

function PeriodUsageSkeleton() {
  return (
    <div role="status" className="animate-pulse space-y-4" aria-label="Loading this period's usage">
      <div className="h-4 w-56 rounded bg-paper-sunk" />
      <div className="grid gap-3 sm:grid-cols-2">
        <div className="h-24 rounded-card bg-paper-sunk" />
        <div className="h-24 rounded-card bg-paper-sunk" />
      </div>
      <div className="h-10 rounded bg-paper-sunk" />
    </div>
  );
}

export default async function BillingPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace, role } = await requireMember(slug, 'billing:read');
  const canManage = can(role, 'billing:manage');
  const [billing, contacts] = await Promise.all([
    ensureBilling({ workspaceId: workspace.id }),
    listBillingContacts({ workspaceId: workspace.id }),
  ]);
  const subscribed = Boolean(billing.subscriptionId) && billing.status !== 'canceled';
  const trialLeft = billing.status === 'trialing' && !!billing.trialEndsAt && daysUntil(billing.trialEndsAt) > 0;
  const card = cardChoiceForLabel(billing.paymentMethodLabel);

  return (
    <>
      <PageHeader
        title="Billing"
        lead={`${workspace.name}: plan, metered usage and invoices. One unit is one screened flight: a saved screening, or an imported flight once it is screened.`}
      />
      <div className="space-y-6">
        <StatusNotice billing={billing} />
        <div className="grid gap-6 lg:grid-cols-3">
          <Card title="Subscription">
            <PlanSummary billing={billing} />
          </Card>
          <Card title="This period" className="lg:col-span-2">
            <Suspense fallback={<PeriodUsageSkeleton />}>
              <PeriodUsage slug={slug} workspaceId={workspace.id} />
            </Suspense>
          </Card>
        </div>

        {canManage ? (
          <div className="grid gap-6 lg:grid-cols-2">
            <Card title={subscribed ? 'Change plan' : 'Subscribe'}>
              {subscribed ? (
                <div className="space-y-6">
                  <ChangePlanForm slug={slug} planId={billing.planId} subscribed />
                  <div className="border-t border-line pt-4">
                    <h3 className="mb-2 text-sm font-semibold text-ink">
                      {billing.cancelAtPeriodEnd ? 'Cancellation scheduled' : 'Cancel'}
                    </h3>
                    <p className="mb-3 text-sm text-ink-soft">
                      {billing.cancelAtPeriodEnd
                        ? `The subscription stops on ${formatDate(billing.currentPeriodEnd)}; the last invoice covers this period.`
                        : 'Cancelling takes effect at the end of the period; the last invoice covers it. Nothing saved is deleted.'}
                    </p>
                    <CancelResume
                      slug={slug}
                      cancelAtPeriodEnd={billing.cancelAtPeriodEnd}
                      periodEnd={billing.currentPeriodEnd}
                    />
                  </div>
                </div>
              ) : (
                <SubscribeForm slug={slug} planId={billing.planId} card={card} trialLeft={trialLeft} />
              )}
            </Card>
            <div className="space-y-6">
              <Card title="Payment method">
                {subscribed ? (
                  <PaymentCardForm slug={slug} card={card} pastDue={billing.status === 'past_due'} />
                ) : (
                  <p className="text-sm text-ink-soft">
                    {billing.paymentMethodLabel ? `${billing.paymentMethodLabel} is on file. ` : ''}Choose the card when
                    you subscribe; it pays every invoice after that and can be changed here at any time.
                  </p>
                )}
              </Card>
              <Card title="Usage budget">
                <UsageBudgetForm slug={slug} budgetCents={billing.usageBudgetCents} hardStop={billing.budgetHardStop} />
                <p className="mt-4 text-xs text-ink-soft">
                  The billing contacts get an e-mail when this period&apos;s usage reaches 80 % and again at 100 % of
                  the budget, once each a period. A free trial has no budget: nothing in it is charged.
                </p>
              </Card>
              <Card title="Billing contacts">
                <BillingEmailForm slug={slug} billingEmail={billing.billingEmail} />
                <p className="mt-4 text-xs text-ink-soft">
                  Payment problems currently go to:{' '}
                  <span className="text-ink">{contacts.length ? contacts.join(', ') : 'nobody yet'}</span>.
                </p>
              </Card>
            </div>
          </div>
        ) : null}

        <Card title="Invoices">
          <Suspense
            fallback={
              <div className="h-24 animate-pulse rounded bg-paper-sunk" role="status" aria-label="Loading invoices" />
            }
          >
            <InvoiceList slug={slug} billing={billing} />
          </Suspense>
        </Card>
      </div>
    </>
  );
}
