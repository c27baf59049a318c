import 'server-only';
import { writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import { getBilling, listBillingToProvision, updateBilling, type BillingDto } from '@/db/billing';
import { log } from '@/lib/log';
import { TEST_CARDS, type CardChoice } from './cards';
import { planPrices } from './catalogue';
import { describeStripeError, stripe } from './stripe';
import { isoFromSeconds, patchFromSubscription } from './sync';

/**
 * Brings the payment service up to date with our billing rows: a customer for every workspace, and
 * for a workspace marked subscribed without a subscription (the demo seed, written before the
 * payment service runs) an active subscription on the test card that succeeds. Idempotent: the
 * requests carry idempotency keys derived from the workspace, and stored ids are never replaced.
 */

export async function ensureCustomer(billing: BillingDto, workspace: { slug: string; name: string }): Promise<string> {
  if (billing.customerId) return billing.customerId;
  // Only stable fields, so a retry with the same key is the same request; the e-mail follows after.
  const customer = await stripe().customers.create(
    { name: workspace.name, metadata: { workspace: workspace.slug } },
    { idempotencyKey: `tp-customer-ws-${billing.workspaceId}` },
  );
  if (billing.billingEmail) await stripe().customers.update(customer.id, { email: billing.billingEmail });
  await updateBilling({ workspaceId: billing.workspaceId }, { customerId: customer.id });
  return customer.id;
}

/** Attaches a test card to the customer and makes it the default for invoices. */
export async function putCardOnFile(customerId: string, card: CardChoice): Promise<void> {
  const pm = await stripe().paymentMethods.attach(TEST_CARDS[card].paymentMethod, { customer: customerId });
  await stripe().customers.update(customerId, { invoice_settings: { default_payment_method: pm.id } });
}

/** How far back a seeded demo subscription starts: one closed period, so one invoice, at first start. */
const SEEDED_BACKDATE_DAYS = 30;

async function subscribeSeeded(billing: BillingDto, workspace: { slug: string }, customerId: string): Promise<void> {
  await putCardOnFile(customerId, 'succeeds');
  const prices = await planPrices(billing.planId);
  // Started a month ago, so the demo has one issued (and paid) invoice to show from the first start.
  const startedAt = Math.floor(Date.now() / 1000);
  const sub = await stripe().subscriptions.create(
    {
      customer: customerId,
      items: [{ price: prices.base }, { price: prices.metered }],
      metadata: { workspace: workspace.slug },
      backdate_start_date: startedAt - SEEDED_BACKDATE_DAYS * 86_400,
    },
    { idempotencyKey: `tp-seeded-subscription-ws-${billing.workspaceId}` },
  );
  await writeTx(async (trx) => {
    const current = await getBilling({ workspaceId: billing.workspaceId }, trx, { forUpdate: true });
    if (current?.subscriptionId && current.subscriptionId !== sub.id) return;
    const patch = patchFromSubscription(sub);
    // A webhook of this subscription may have recorded a later period already: never move it back.
    if (
      current?.subscriptionId === sub.id &&
      current.currentPeriodStart &&
      patch.currentPeriodStart &&
      patch.currentPeriodStart < current.currentPeriodStart
    ) {
      delete patch.currentPeriodStart;
      delete patch.currentPeriodEnd;
    }
    await updateBilling(
      { workspaceId: billing.workspaceId },
      {
        ...patch,
        meteredSince: current?.meteredSince ?? isoFromSeconds(startedAt),
        paymentMethodLabel: TEST_CARDS.succeeds.label,
      },
      trx,
    );
    await createAuditEntry(
      {
        workspaceId: billing.workspaceId,
        actor: 'Tropopass',
        action: 'billing.subscription_provisioned',
        target: sub.id,
        detail: { plan: billing.planId, status: sub.status },
      },
      trx,
    );
  });
}

export interface ProvisionReport {
  customers: number;
  subscriptions: number;
  failed: number;
}

export async function provisionBilling(limit = 20): Promise<ProvisionReport> {
  const report: ProvisionReport = { customers: 0, subscriptions: 0, failed: 0 };
  for (const row of await listBillingToProvision(limit)) {
    try {
      const hadCustomer = Boolean(row.customerId);
      const customerId = await ensureCustomer(row, row);
      if (!hadCustomer) report.customers += 1;
      if (row.status === 'active' && !row.subscriptionId) {
        await subscribeSeeded(row, row, customerId);
        report.subscriptions += 1;
      }
    } catch (err) {
      report.failed += 1;
      log.warn(
        { event: 'billing.provision_failed', workspaceId: row.workspaceId, error: describeStripeError(err) },
        'billing provisioning will retry',
      );
    }
  }
  return report;
}
