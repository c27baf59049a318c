import 'server-only';
import type Stripe from 'stripe';
import type { BillingDto, BillingPatch, BillingStatus } from '@/db/billing';
import { planForLookupKey } from './plans';

/** Unix seconds from the payment service -> ISO UTC text as stored. */
export const isoFromSeconds = (seconds: number): string => new Date(seconds * 1000).toISOString();
export const secondsFromIso = (iso: string): number => Math.floor(Date.parse(iso) / 1000);

/** The workspace's billing status for a subscription status (the gate knows only these four). */
export function statusFromSubscription(status: Stripe.Subscription.Status): BillingStatus {
  if (status === 'active') return 'active';
  if (status === 'trialing') return 'trialing';
  if (status === 'canceled' || status === 'incomplete_expired') return 'canceled';
  // past_due, unpaid, incomplete, paused: money is owed or the subscription is on hold; new work waits.
  return 'past_due';
}

/** What the workspace's billing row should say about this subscription. */
export function patchFromSubscription(sub: Stripe.Subscription): BillingPatch {
  const items = sub.items.data;
  const base = items.find((i) => i.price.recurring?.usage_type !== 'metered') ?? items[0];
  const plan = base?.price.lookup_key ? planForLookupKey(base.price.lookup_key)?.plan.id : undefined;
  const patch: BillingPatch = {
    status: statusFromSubscription(sub.status),
    subscriptionId: sub.id,
    cancelAtPeriodEnd: sub.cancel_at_period_end,
  };
  if (plan) patch.planId = plan;
  if (items[0]) {
    patch.currentPeriodStart = isoFromSeconds(items[0].current_period_start);
    patch.currentPeriodEnd = isoFromSeconds(items[0].current_period_end);
  }
  if (sub.status === 'trialing' && sub.trial_end) patch.trialEndsAt = isoFromSeconds(sub.trial_end);
  if (sub.status === 'canceled') patch.cancelAtPeriodEnd = false;
  return patch;
}

export type BillingChanges = Partial<Record<keyof BillingPatch, { from: unknown; to: unknown }>>;

/** The fields of `patch` that differ from the row: what an audit entry records. */
export function billingChanges(before: BillingDto, patch: BillingPatch): BillingChanges {
  const changes: BillingChanges = {};
  for (const key of Object.keys(patch) as (keyof BillingPatch)[]) {
    const to = patch[key];
    if (to === undefined) continue;
    const from = before[key];
    if (from !== to) changes[key] = { from, to };
  }
  return changes;
}

export function customerIdOf(value: string | { id: string } | null | undefined): string | null {
  if (!value) return null;
  return typeof value === 'string' ? value : value.id;
}
