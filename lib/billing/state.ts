import 'server-only';
import type { BillingDto } from '@/db/billing';
import { cardChoiceForLabel } from './cards';
import { PLANS } from './plans';

/** The billing state as the billing API and page show it: no payment-service ids or text. */
export function publicBillingState(billing: BillingDto) {
  const plan = PLANS[billing.planId];
  return {
    planId: billing.planId,
    planName: plan.name,
    baseFeeCents: plan.baseFeeCents,
    perFlightCents: plan.perFlightCents,
    status: billing.status,
    subscribed: Boolean(billing.subscriptionId) && billing.status !== 'canceled',
    trialEndsAt: billing.trialEndsAt,
    currentPeriodStart: billing.currentPeriodStart,
    currentPeriodEnd: billing.currentPeriodEnd,
    cancelAtPeriodEnd: billing.cancelAtPeriodEnd,
    billingEmail: billing.billingEmail,
    paymentMethod: billing.paymentMethodLabel
      ? { card: cardChoiceForLabel(billing.paymentMethodLabel), label: billing.paymentMethodLabel }
      : null,
    paymentFailedAt: billing.paymentFailedAt,
  };
}
