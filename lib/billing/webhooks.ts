import 'server-only';
import type Stripe from 'stripe';
import { db, writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import {
  findBillingByCustomer,
  listBillingContacts,
  recordWebhookEvent,
  updateBilling,
  type BillingDto,
  type BillingPatch,
} from '@/db/billing';
import { appUrl } from '@/lib/env';
import { log } from '@/lib/log';
import { sendMail } from '@/lib/mail/mailer';
import { paymentFailedMail } from './emails';
import { billingChanges, customerIdOf, isoFromSeconds, patchFromSubscription } from './sync';

/**
 * Applies a verified payment-service event to the workspace's billing state. The event id is recorded
 * in the same transaction as the change, so a replayed event changes nothing and logs nothing.
 */

export type WebhookOutcome =
  | { result: 'duplicate' }
  | { result: 'ignored'; reason: string }
  | { result: 'processed'; workspaceId: number; changed: boolean };

const AUDIT_ACTOR = 'payment service';

interface PaymentFailure {
  workspaceId: number;
  invoiceNumber: string | null;
  amountDueCents: number;
}

function subscriptionOfInvoice(invoice: Stripe.Invoice): string | null {
  const sub = invoice.parent?.subscription_details?.subscription;
  if (!sub) return null;
  return typeof sub === 'string' ? sub : sub.id;
}

/** Whether an event about `subscriptionId` is about the workspace's current subscription. */
function isCurrent(billing: BillingDto, subscriptionId: string | null, isCreation: boolean): boolean {
  if (!subscriptionId || !billing.subscriptionId || billing.subscriptionId === subscriptionId) return true;
  // A new subscription after a canceled one replaces it.
  return isCreation && billing.status === 'canceled';
}

export async function handleStripeEvent(event: Stripe.Event): Promise<WebhookOutcome> {
  const after: { failure?: PaymentFailure } = {};
  const outcome = await writeTx(async (trx): Promise<WebhookOutcome> => {
    if (!(await recordWebhookEvent(trx, event))) return { result: 'duplicate' };

    switch (event.type) {
      case 'customer.subscription.created':
      case 'customer.subscription.updated':
      case 'customer.subscription.deleted': {
        const sub = event.data.object;
        const customerId = customerIdOf(sub.customer);
        // Locked until this event is recorded: provisioning writing the same subscription meanwhile
        // (PostgreSQL) would otherwise be overwritten with what this event read before it.
        const billing = customerId ? await findBillingByCustomer(customerId, trx, { forUpdate: true }) : null;
        if (!billing) return { result: 'ignored', reason: 'unknown customer' };
        const creation = event.type === 'customer.subscription.created';
        if (!isCurrent(billing, sub.id, creation)) return { result: 'ignored', reason: 'not the current subscription' };
        const patch: BillingPatch = patchFromSubscription(sub);
        // Events may arrive out of order: one that describes an earlier period of the same subscription
        // (the creation event of a backdated start, delivered after the first period closed) must not
        // move the period back.
        if (
          billing.subscriptionId === sub.id &&
          billing.currentPeriodStart &&
          patch.currentPeriodStart &&
          patch.currentPeriodStart < billing.currentPeriodStart
        ) {
          delete patch.currentPeriodStart;
          delete patch.currentPeriodEnd;
        }
        if (event.type === 'customer.subscription.deleted') patch.status = 'canceled';
        // From when the subscription was made, not its start date: a backdated start must not bill
        // usage recorded before the subscription existed (for any other, the two are the same).
        if (billing.subscriptionId !== sub.id) patch.meteredSince = isoFromSeconds(sub.created);
        else if (!billing.meteredSince) patch.meteredSince = isoFromSeconds(sub.created);
        if (patch.status === 'active') patch.paymentFailedAt = null;
        const changes = billingChanges(billing, patch);
        if (Object.keys(changes).length === 0)
          return { result: 'processed', workspaceId: billing.workspaceId, changed: false };
        await updateBilling({ workspaceId: billing.workspaceId }, patch, trx);
        await createAuditEntry(
          {
            workspaceId: billing.workspaceId,
            actor: AUDIT_ACTOR,
            action:
              event.type === 'customer.subscription.deleted'
                ? 'billing.subscription_ended'
                : 'billing.subscription_changed',
            target: event.id,
            detail: { event: event.type, subscription: sub.id, changes },
          },
          trx,
        );
        return { result: 'processed', workspaceId: billing.workspaceId, changed: true };
      }

      case 'invoice.paid':
      case 'invoice.payment_failed': {
        const invoice = event.data.object;
        const customerId = customerIdOf(invoice.customer);
        const billing = customerId ? await findBillingByCustomer(customerId, trx) : null;
        if (!billing) return { result: 'ignored', reason: 'unknown customer' };
        if (!isCurrent(billing, subscriptionOfInvoice(invoice), false))
          return { result: 'ignored', reason: 'not the current subscription' };
        const patch: BillingPatch = {};
        if (event.type === 'invoice.payment_failed') {
          if (billing.status !== 'canceled') patch.status = 'past_due';
          patch.paymentFailedAt = isoFromSeconds(event.created);
        } else if (billing.status === 'past_due') {
          patch.status = 'active';
          patch.paymentFailedAt = null;
        }
        const changes = billingChanges(billing, patch);
        if (Object.keys(changes).length) await updateBilling({ workspaceId: billing.workspaceId }, patch, trx);
        const paid = event.type === 'invoice.paid';
        await createAuditEntry(
          {
            workspaceId: billing.workspaceId,
            actor: AUDIT_ACTOR,
            action: paid ? 'billing.invoice_paid' : 'billing.payment_failed',
            target: event.id,
            detail: {
              invoice: invoice.number ?? invoice.id,
              [paid ? 'amountPaidCents' : 'amountDueCents']: paid ? invoice.amount_paid : invoice.amount_due,
              changes,
            },
          },
          trx,
        );
        if (!paid)
          after.failure = {
            workspaceId: billing.workspaceId,
            invoiceNumber: invoice.number ?? null,
            amountDueCents: invoice.amount_due,
          };
        return { result: 'processed', workspaceId: billing.workspaceId, changed: Object.keys(changes).length > 0 };
      }

      default:
        return { result: 'ignored', reason: `not handled: ${event.type}` };
    }
  });
  if (after.failure) await notifyPaymentFailed(after.failure);
  return outcome;
}

/** E-mails each billing contact; a mail failure is logged and never undoes the recorded event. */
async function notifyPaymentFailed(failure: PaymentFailure): Promise<void> {
  try {
    const ws = await db()('workspaces').where({ id: failure.workspaceId }).first('slug', 'name');
    if (!ws) return;
    const contacts = await listBillingContacts({ workspaceId: failure.workspaceId });
    const billingUrl = new URL(`/w/${ws.slug}/settings/billing`, appUrl()).toString();
    for (const to of contacts) {
      await sendMail(
        paymentFailedMail(to, {
          workspaceName: ws.name,
          invoiceNumber: failure.invoiceNumber,
          amountDueCents: failure.amountDueCents,
          billingUrl,
        }),
      );
    }
  } catch (err) {
    log.error(
      { event: 'billing.payment_failed_mail', workspaceId: failure.workspaceId, err },
      'could not e-mail the billing contacts',
    );
  }
}
