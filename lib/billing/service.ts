import 'server-only';
import type Stripe from 'stripe';
import { writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import { getBilling, updateBilling, type BillingDto, type BillingPatch } from '@/db/billing';
import { ensureBilling } from '@/lib/billing/trial';
import type { WorkspaceDto } from '@/db/workspaces';
import { env } from '@/lib/env';
import { AppError, conflict, notFound, paymentRequired } from '@/lib/errors';
import { TEST_CARDS, type CardChoice } from './cards';
import { planPrices } from './catalogue';
import { providerError } from './errors';
import { PLANS, planForLookupKey, type PlanId } from './plans';
import { ensureCustomer, putCardOnFile } from './provision';
import { isStripeError, stripe } from './stripe';
import { isoFromSeconds, patchFromSubscription, secondsFromIso } from './sync';

/**
 * What owners and finance admins do on the billing page: subscribe, change plan, cancel or resume at
 * period end, put a test card on file, pay an open invoice, set the billing e-mail. Each asks the
 * payment service first and records the result (with an audit entry) only once it has agreed; the
 * webhook that follows then finds nothing left to change.
 */

export interface BillingActor {
  userId: number;
  email: string;
}

type Scope = Pick<WorkspaceDto, 'id' | 'slug' | 'name'>;

async function record(
  scope: Scope,
  actor: BillingActor,
  action: string,
  patch: BillingPatch,
  detail: Record<string, unknown>,
): Promise<void> {
  await writeTx(async (trx) => {
    await updateBilling({ workspaceId: scope.id }, patch, trx);
    await createAuditEntry(
      { workspaceId: scope.id, userId: actor.userId, actor: actor.email, action, target: scope.slug, detail },
      trx,
    );
  });
}

/** A key that makes a double-submitted action one request, while a later action gets a fresh one. */
const actionKey = (billing: BillingDto, action: string, ...parts: string[]) =>
  `tp-${action}-ws-${billing.workspaceId}-${[...parts, billing.updatedAt].join('-')}`;

async function providerCall<T>(action: string, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (err) {
    throw providerError(err, action);
  }
}

function activeSubscriptionId(billing: BillingDto): string {
  if (!billing.subscriptionId || billing.status === 'canceled') {
    throw conflict('This workspace has no running subscription. Subscribe first.');
  }
  return billing.subscriptionId;
}

export async function subscribeWorkspace(
  scope: Scope,
  actor: BillingActor,
  input: { planId: PlanId; card: CardChoice },
): Promise<BillingDto> {
  const billing = await ensureBilling({ workspaceId: scope.id });
  if (billing.subscriptionId && billing.status !== 'canceled') {
    throw conflict('This workspace is already subscribed. Change the plan instead.');
  }
  const trialEndsAt =
    billing.status === 'trialing' && billing.trialEndsAt && Date.parse(billing.trialEndsAt) > Date.now() + 60_000
      ? billing.trialEndsAt
      : null;
  const sub = await providerCall('subscribe', async () => {
    const customerId = await ensureCustomer(billing, scope);
    await putCardOnFile(customerId, input.card);
    const prices = await planPrices(input.planId);
    return stripe().subscriptions.create(
      {
        customer: customerId,
        items: [{ price: prices.base }, { price: prices.metered }],
        metadata: { workspace: scope.slug },
        ...(trialEndsAt ? { trial_end: secondsFromIso(trialEndsAt) } : {}),
      },
      { idempotencyKey: actionKey(billing, 'subscribe', input.planId, input.card) },
    );
  });
  await record(
    scope,
    actor,
    'billing.subscribed',
    {
      ...patchFromSubscription(sub),
      meteredSince: isoFromSeconds(sub.start_date),
      paymentMethodLabel: TEST_CARDS[input.card].label,
      paymentFailedAt: null,
    },
    { plan: input.planId, status: sub.status, subscription: sub.id, freeUntil: trialEndsAt },
  );
  return (await getBilling({ workspaceId: scope.id })) as BillingDto;
}

export async function changePlan(scope: Scope, actor: BillingActor, planId: PlanId): Promise<{ changed: boolean }> {
  const billing = await ensureBilling({ workspaceId: scope.id });
  if (billing.planId === planId) return { changed: false };
  if (!billing.subscriptionId || billing.status === 'canceled') {
    await record(scope, actor, 'billing.plan_changed', { planId }, { from: billing.planId, to: planId });
    return { changed: true };
  }
  const subscriptionId = billing.subscriptionId;
  const updated = await providerCall('change_plan', async () => {
    const [sub, prices] = await Promise.all([stripe().subscriptions.retrieve(subscriptionId), planPrices(planId)]);
    const items = sub.items.data.map((item) => {
      const metered =
        (item.price.lookup_key ? planForLookupKey(item.price.lookup_key)?.kind === 'metered' : false) ||
        item.price.recurring?.usage_type === 'metered';
      return { id: item.id, price: metered ? prices.metered : prices.base };
    });
    return stripe().subscriptions.update(
      subscriptionId,
      { items, proration_behavior: 'none' },
      { idempotencyKey: actionKey(billing, 'plan', planId) },
    );
  });
  await record(scope, actor, 'billing.plan_changed', patchFromSubscription(updated), {
    from: billing.planId,
    to: planId,
    subscription: updated.id,
  });
  return { changed: true };
}

export async function setCancelAtPeriodEnd(scope: Scope, actor: BillingActor, cancel: boolean): Promise<void> {
  const billing = await ensureBilling({ workspaceId: scope.id });
  const subscriptionId = activeSubscriptionId(billing);
  if (billing.cancelAtPeriodEnd === cancel) return;
  const updated = await providerCall(cancel ? 'cancel' : 'resume', () =>
    stripe().subscriptions.update(
      subscriptionId,
      { cancel_at_period_end: cancel },
      { idempotencyKey: actionKey(billing, cancel ? 'cancel' : 'resume') },
    ),
  );
  await record(scope, actor, cancel ? 'billing.cancel_scheduled' : 'billing.resumed', patchFromSubscription(updated), {
    subscription: updated.id,
    periodEnd: billing.currentPeriodEnd,
  });
}

export interface PaymentAttempt {
  /** Open invoices paid just now. */
  paid: number;
}

async function openInvoices(customerId: string): Promise<Stripe.Invoice[]> {
  const list = await stripe().invoices.list({ customer: customerId, status: 'open', limit: 20 });
  return list.data;
}

/** Charges every open invoice with the card on file, oldest first; a decline stops with a 402. */
export async function payOpenInvoices(scope: Scope, actor: BillingActor): Promise<PaymentAttempt> {
  const billing = await ensureBilling({ workspaceId: scope.id });
  const customerId = billing.customerId;
  if (!customerId) return { paid: 0 };
  let paid = 0;
  let declined = false;
  try {
    const invoices = await openInvoices(customerId);
    for (const invoice of [...invoices].reverse()) {
      try {
        await stripe().invoices.pay(invoice.id);
        paid += 1;
      } catch (err) {
        if (isStripeError(err) && err.code === 'invoice_already_paid') continue;
        if (isStripeError(err) && (err.type === 'StripeCardError' || err.code === 'card_declined')) {
          declined = true;
          break;
        }
        throw err;
      }
    }
  } catch (err) {
    throw providerError(err, 'pay_invoice');
  }
  const patch: BillingPatch = {};
  if (billing.subscriptionId && (paid > 0 || declined)) {
    const subscriptionId = billing.subscriptionId;
    const sub = await providerCall('pay_invoice', () => stripe().subscriptions.retrieve(subscriptionId));
    Object.assign(patch, patchFromSubscription(sub));
    if (patch.status === 'active') patch.paymentFailedAt = null;
  }
  await record(scope, actor, 'billing.invoice_payment_attempted', patch, { paid, declined });
  if (declined) {
    throw paymentRequired(
      'The card on file was declined, so the invoice is still open. Put the test card that succeeds on file, then pay again.',
    );
  }
  return { paid };
}

export async function setPaymentCard(scope: Scope, actor: BillingActor, card: CardChoice): Promise<{ label: string }> {
  const billing = await ensureBilling({ workspaceId: scope.id });
  await providerCall('payment_method', async () => {
    const customerId = await ensureCustomer(billing, scope);
    await putCardOnFile(customerId, card);
  });
  await record(
    scope,
    actor,
    'billing.payment_method_changed',
    { paymentMethodLabel: TEST_CARDS[card].label },
    { from: billing.paymentMethodLabel, to: TEST_CARDS[card].label },
  );
  return { label: TEST_CARDS[card].label };
}

export async function updateBillingEmail(scope: Scope, actor: BillingActor, email: string | null): Promise<void> {
  const billing = await ensureBilling({ workspaceId: scope.id });
  if ((billing.billingEmail ?? null) === email) return;
  const customerId = billing.customerId;
  if (customerId)
    await providerCall('billing_email', () => stripe().customers.update(customerId, { email: email ?? '' }));
  await record(
    scope,
    actor,
    'billing.email_changed',
    { billingEmail: email },
    { from: billing.billingEmail, to: email },
  );
}

export interface InvoiceDto {
  id: string;
  number: string | null;
  status: string;
  periodStart: string;
  periodEnd: string;
  createdAt: string;
  amountDueCents: number;
  amountPaidCents: number;
  amountRemainingCents: number;
  hasPdf: boolean;
}

export async function listInvoices(billing: BillingDto, limit = 24): Promise<InvoiceDto[]> {
  const customerId = billing.customerId;
  if (!customerId) return [];
  const list = await providerCall('list_invoices', () => stripe().invoices.list({ customer: customerId, limit }));
  return list.data.map((inv) => ({
    id: inv.id,
    number: inv.number ?? null,
    status: inv.status ?? 'draft',
    periodStart: isoFromSeconds(inv.period_start),
    periodEnd: isoFromSeconds(inv.period_end),
    createdAt: isoFromSeconds(inv.created),
    amountDueCents: inv.amount_due,
    amountPaidCents: inv.amount_paid,
    amountRemainingCents: inv.amount_remaining,
    hasPdf: Boolean(inv.invoice_pdf),
  }));
}

/** Where invoice documents may be fetched from: the configured payment API host (the local fake), or the hosted service. */
function allowedDocumentUrl(raw: string): URL | null {
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    return null;
  }
  const e = env();
  const configured =
    url.protocol === `${e.STRIPE_API_PROTOCOL}:` &&
    url.hostname === e.STRIPE_API_HOST &&
    Number(url.port || (url.protocol === 'https:' ? 443 : 80)) === e.STRIPE_API_PORT;
  const hosted = url.protocol === 'https:' && (url.hostname === 'stripe.com' || url.hostname.endsWith('.stripe.com'));
  return configured || hosted ? url : null;
}

/** The invoice's PDF, fetched for a member of the workspace the invoice belongs to. */
export async function getInvoicePdf(
  billing: BillingDto,
  invoiceId: string,
): Promise<{ filename: string; body: ArrayBuffer }> {
  if (!billing.customerId || !/^in_[A-Za-z0-9]{1,64}$/.test(invoiceId))
    throw notFound('No such invoice in this workspace.');
  let invoice: Stripe.Invoice;
  try {
    invoice = await stripe().invoices.retrieve(invoiceId);
  } catch (err) {
    if (isStripeError(err) && err.statusCode === 404) throw notFound('No such invoice in this workspace.');
    throw providerError(err, 'invoice_pdf');
  }
  const owner = typeof invoice.customer === 'string' ? invoice.customer : invoice.customer?.id;
  if (owner !== billing.customerId) throw notFound('No such invoice in this workspace.');
  const url = invoice.invoice_pdf ? allowedDocumentUrl(invoice.invoice_pdf) : null;
  if (!url) throw notFound('This invoice has no document yet.');
  const res = await fetch(url, { signal: AbortSignal.timeout(env().STRIPE_TIMEOUT_MS) }).catch(() => null);
  if (!res?.ok)
    throw new AppError('unavailable', 'The invoice document could not be fetched just now. Try again in a minute.');
  return { filename: `${invoice.number ?? invoice.id}.pdf`, body: await res.arrayBuffer() };
}

export function planLabel(planId: PlanId): string {
  return PLANS[planId].name;
}
