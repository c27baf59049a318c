import { describe, expect, it } from 'vitest';
import { reconciliationWindow } from '@/lib/billing/reconcile';
import { statusFromSubscription } from '@/lib/billing/sync';
import { usagePeriod } from '@/lib/billing/usage-summary';
import { TRIAL_DAYS } from '@/lib/billing/plans';
import type { BillingDto } from '@/db/billing';

const s = (iso: string) => Date.parse(iso) / 1000;

describe('reconciliation window (meter summaries need minute-aligned bounds)', () => {
  it.each([
    ['2026-12-01T10:20:35Z', '2026-12-01T10:45:10Z', '2026-12-01T10:20:00Z', '2026-12-01T10:46:00Z'],
    ['2026-12-01T10:20:00Z', '2026-12-01T10:20:00Z', '2026-12-01T10:20:00Z', '2026-12-01T10:21:00Z'],
    ['2026-12-01T10:20:00Z', '2026-12-01T10:20:59Z', '2026-12-01T10:20:00Z', '2026-12-01T10:21:00Z'],
    ['2026-12-01T10:20:59Z', '2026-12-01T10:21:00Z', '2026-12-01T10:20:00Z', '2026-12-01T10:22:00Z'],
  ])('period from %s, now %s -> [%s, %s)', (periodStart, now, start, end) => {
    const w = reconciliationWindow(periodStart, new Date(now));
    expect(w).toEqual({ start: s(start), end: s(end) });
    expect(w.start % 60).toBe(0);
    expect(w.end % 60).toBe(0);
    // The current second is inside the window, so a unit sent just now is compared.
    expect(w.end).toBeGreaterThan(Math.floor(Date.parse(now) / 1000));
  });
});

describe('subscription status -> workspace status', () => {
  it.each([
    ['active', 'active'],
    ['trialing', 'trialing'],
    ['past_due', 'past_due'],
    ['unpaid', 'past_due'],
    ['incomplete', 'past_due'],
    ['paused', 'past_due'],
    ['canceled', 'canceled'],
    ['incomplete_expired', 'canceled'],
  ] as const)('%s -> %s', (provider, ours) => {
    expect(statusFromSubscription(provider)).toBe(ours);
  });
});

describe('usage period', () => {
  const base: BillingDto = {
    workspaceId: 1,
    planId: 'crew',
    status: 'trialing',
    trialEndsAt: null,
    customerId: null,
    subscriptionId: null,
    currentPeriodStart: null,
    currentPeriodEnd: null,
    cancelAtPeriodEnd: false,
    billingEmail: null,
    paymentMethodLabel: null,
    meteredSince: null,
    paymentFailedAt: null,
    reconciliation: null,
    usageBudgetCents: null,
    budgetHardStop: false,
    updatedAt: '2026-12-01T00:00:00.000Z',
  };
  it('is the subscription period when there is one', () => {
    expect(
      usagePeriod({
        ...base,
        currentPeriodStart: '2026-11-03T08:00:00.000Z',
        currentPeriodEnd: '2026-12-03T08:00:00.000Z',
      }),
    ).toEqual({
      start: '2026-11-03T08:00:00.000Z',
      end: '2026-12-03T08:00:00.000Z',
    });
  });
  it('is the free trial before any subscription', () => {
    const p = usagePeriod({ ...base, trialEndsAt: '2026-12-15T12:00:00.000Z' });
    expect(p.end).toBe('2026-12-15T12:00:00.000Z');
    expect(Date.parse(p.end) - Date.parse(p.start)).toBe(TRIAL_DAYS * 86_400_000);
  });
});
