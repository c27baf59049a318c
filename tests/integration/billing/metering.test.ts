import { describe, expect, it } from 'vitest';
import type Stripe from 'stripe';
import { apiRequest, call, makeWorkspace, sessionCookie, TEST_ORIGIN } from '../../support/test-db';
import { db } from '@/db/client';
import { getBilling } from '@/db/billing';
import { resetEnvForTests } from '@/lib/env';
import { PLANS, estimateChargeCents, type PlanId } from '@/lib/billing/plans';
import {
  BACKOFF_BASE_MS,
  BACKOFF_MAX_MS,
  MAX_BATCH_UNITS,
  backoffMs,
  sendPendingUsage,
} from '@/lib/billing/usage-sender';
import { formUsageBatches } from '@/db/usage-batches';
import { reconcileUsage } from '@/lib/billing/reconcile';
import { getUsageSummary } from '@/lib/billing/usage-summary';
import * as subscriptionRoute from '@/app/api/v1/workspaces/[slug]/billing/subscription/route';
import * as usageRoute from '@/app/api/v1/workspaces/[slug]/usage/route';
import type { FakeState } from '@/lib/fakes/payment/server';
import { screen, useBillingHarness } from './harness';

const h = useBillingHarness();

type Usage = {
  units: number;
  periodStart: string;
  periodEnd: string;
  estimatedChargeCents: number;
  planId: PlanId;
  status: string;
  sentUnits: number;
  pendingUnits: number;
  reconciliation: { ledgerUnits: number; providerUnits: number; difference: number; checkedAt: string } | null;
};

const FAR_FUTURE = new Date(Date.now() + 365 * 86_400_000);

/** A workspace whose trial is over, subscribed to `planId` with the card that succeeds. */
async function subscribed(planId: PlanId) {
  const ws = await makeWorkspace(['billing', 'planner']);
  await db()('workspace_billing')
    .where({ workspace_id: ws.id })
    .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString() });
  const cookie = await sessionCookie(ws.members.billing.id);
  const r = await call(
    subscriptionRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/subscription`, {
      cookie,
      body: { planId, card: 'succeeds' },
      origin: TEST_ORIGIN,
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(201);
  const billing = await getBilling({ workspaceId: ws.id });
  return { ws, billing: billing!, financeCookie: cookie };
}

async function screenMany(slug: string, userId: number, n: number) {
  for (let i = 0; i < n; i++) expect((await screen(slug, userId)).status).toBe(201);
}

async function batchIdentifiers(workspaceId: number): Promise<string[]> {
  return (await db()('usage_batches').where({ workspace_id: workspaceId }).orderBy('id').select('identifier')).map(
    (r: { identifier: string }) => r.identifier,
  );
}

/** The UTC minutes the workspace's ledger rows fall in: a batch never spans two. */
async function ledgerMinutes(workspaceId: number): Promise<number> {
  const rows = (await db()('usage_events').where({ workspace_id: workspaceId }).select('occurred_at')) as {
    occurred_at: string;
  }[];
  return new Set(rows.map((r) => r.occurred_at.slice(0, 16))).size;
}

async function meterEventsOf(customerId: string) {
  const { body } = await h.control<FakeState>('/_fake/state');
  return body.meterEvents.filter((e) => e.customer === customerId);
}

async function usage(slug: string, cookie: string) {
  return call<Usage>(usageRoute.GET, apiRequest('GET', `/api/v1/workspaces/${slug}/usage`, { cookie }), { slug });
}

/** Sends until nothing is due, treating every scheduled retry as due (at most `rounds` passes). */
async function drain(workspaceId: number, rounds = 60) {
  let attempts = 0;
  for (let i = 0; i < rounds; i++) {
    const r = await sendPendingUsage({ asOf: FAR_FUTURE, workspaceId });
    attempts += r.attempted;
    if (r.attempted === 0) return attempts;
  }
  throw new Error('usage still pending after all rounds');
}

describe('screenings -> meter events -> invoice', () => {
  it.each<PlanId>(['crew', 'fleet'])(
    '%s: the ledger rows of a minute become one meter event carrying their count; the closed period is billed base + units x per-flight price',
    async (planId) => {
      const { ws, billing, financeCookie } = await subscribed(planId);
      const units = 7;
      await screenMany(ws.slug, ws.members.planner.id, units);

      const before = await usage(ws.slug, financeCookie);
      expect(before.status).toBe(200);
      expect(before.body).toMatchObject({ units, pendingUnits: units, sentUnits: 0, planId, status: 'active' });
      // The estimate uses the plan catalogue: base fee + units x per-flight price (our own prices, plans.ts).
      expect(before.body.estimatedChargeCents).toBe(PLANS[planId].baseFeeCents + units * PLANS[planId].perFlightCents);

      const report = await sendPendingUsage({ workspaceId: ws.id });
      const minutes = await ledgerMinutes(ws.id);
      expect(report).toMatchObject({
        batchedUnits: units,
        batchesFormed: minutes,
        attempted: minutes,
        sent: minutes,
        failed: 0,
        unitsDelivered: units,
      });
      const events = await meterEventsOf(billing.customerId!);
      expect(events.map((e) => e.identifier).sort()).toEqual((await batchIdentifiers(ws.id)).sort());
      expect(events.reduce((s, e) => s + e.value, 0)).toBe(units);

      const after = await usage(ws.slug, financeCookie);
      expect(after.body).toMatchObject({ units, sentUnits: units, pendingUnits: 0 });
      expect(after.body.reconciliation).toMatchObject({ ledgerUnits: units, providerUnits: units, difference: 0 });

      const { body } = await h.control<{ invoice: Stripe.Invoice }>('/_fake/advance', {
        subscription: billing.subscriptionId,
        wait: true,
      });
      // The fake computes the invoice from its own prices and the meter events it holds.
      expect(body.invoice.amount_due).toBe(estimateChargeCents(planId, units));
      expect(body.invoice.amount_due).toBe(before.body.estimatedChargeCents);
      expect(body.invoice.status).toBe('paid');

      // The next period starts empty, at the payment service's new period start.
      const next = await usage(ws.slug, financeCookie);
      expect(next.body.units).toBe(0);
      expect(Date.parse(next.body.periodStart)).toBeGreaterThan(Date.parse(before.body.periodStart));
      expect(next.body.estimatedChargeCents).toBe(PLANS[planId].baseFeeCents);
    },
  );

  it('a free trial is not metered: its units are never sent', async () => {
    const ws = await makeWorkspace(['planner']);
    await screenMany(ws.slug, ws.members.planner.id, 2);
    const r = await sendPendingUsage({ workspaceId: ws.id, asOf: FAR_FUTURE });
    expect(r.attempted).toBe(0);
    const u = await usage(ws.slug, await sessionCookie(ws.owner.id));
    expect(u.body).toMatchObject({ units: 2, estimatedChargeCents: 0, status: 'trialing', pendingUnits: 0 });
  });
});

describe('delivery faults', () => {
  it('the fake failing 50 % of meter-event calls: after retries its total equals the ledger, no unit lost or doubled', async () => {
    const { ws, billing } = await subscribed('crew');
    const units = 30;
    await screenMany(ws.slug, ws.members.planner.id, units);
    await h.control('/_fake/faults', { failRate: 0.5, status: 500, onlyPaths: ['/v1/billing/meter_events'], seed: 7 });
    try {
      // Bounds from the clock before the pass, not from "now" after it, so a slow machine cannot flake them.
      const before = Date.now();
      // Three units a batch: ten meter events, so some fail and some get through.
      const first = await sendPendingUsage({ workspaceId: ws.id, maxBatchUnits: 3 });
      expect(first.batchesFormed).toBeGreaterThanOrEqual(10);
      expect(first.failed).toBeGreaterThan(0);
      expect(first.sent).toBeGreaterThan(0);
      const retried = await db()('usage_batches')
        .where({ workspace_id: ws.id })
        .whereNull('sent_at')
        .select('send_attempts', 'next_attempt_at', 'last_error');
      expect(retried.length).toBe(first.failed);
      const unsentRows = await db()('usage_events')
        .where({ workspace_id: ws.id })
        .whereNull('sent_at')
        .count({ n: '*' })
        .first();
      expect(Number(unsentRows?.n)).toBe(units - first.unitsDelivered);
      // The billing page tells the finance admin how many units wait for a retry.
      expect((await getUsageSummary({ workspaceId: ws.id }, { reconcile: false })).retryingUnits).toBe(
        units - first.unitsDelivered,
      );
      for (const row of retried) {
        expect(row.send_attempts).toBe(1);
        expect(Date.parse(row.next_attempt_at)).toBeGreaterThanOrEqual(before + BACKOFF_BASE_MS / 2);
        expect(row.last_error).toContain('500');
      }
      // Not due yet: a pass before the shortest backoff has run out sends nothing.
      expect(
        (await sendPendingUsage({ workspaceId: ws.id, asOf: new Date(before + BACKOFF_BASE_MS / 2 - 1) })).attempted,
      ).toBe(0);
      await drain(ws.id);
    } finally {
      await h.control('/_fake/faults', undefined, 'DELETE');
    }
    const events = await meterEventsOf(billing.customerId!);
    const ids = events.map((e) => e.identifier);
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids.sort()).toEqual((await batchIdentifiers(ws.id)).sort());
    expect(events.reduce((s, e) => s + e.value, 0)).toBe(units);
    const rec = await reconcileUsage({ workspaceId: ws.id });
    expect(rec).toMatchObject({ ledgerUnits: units, providerUnits: units, difference: 0 });
    const { body } = await h.control<{ invoice: Stripe.Invoice }>('/_fake/advance', {
      subscription: billing.subscriptionId,
    });
    expect(body.invoice.amount_due).toBe(estimateChargeCents('crew', units));
  });

  it('429s are retried the same way', async () => {
    const { ws, billing } = await subscribed('crew');
    await screenMany(ws.slug, ws.members.planner.id, 3);
    await h.control('/_fake/faults', { failNext: 2, status: 429, onlyPaths: ['/v1/billing/meter_events'] });
    try {
      const first = await sendPendingUsage({ workspaceId: ws.id, maxBatchUnits: 1 });
      expect(first).toMatchObject({ failed: 2, sent: 1 });
      await drain(ws.id);
    } finally {
      await h.control('/_fake/faults', undefined, 'DELETE');
    }
    expect((await meterEventsOf(billing.customerId!)).length).toBe(3);
  });

  it('a reply that times out after the service recorded the event: the retry is answered from the idempotency key, counted once', async () => {
    const { ws, billing } = await subscribed('fleet');
    await screenMany(ws.slug, ws.members.planner.id, 2);
    process.env.STRIPE_TIMEOUT_MS = '150';
    resetEnvForTests();
    await h.control('/_fake/faults', { delayMs: 600, onlyPaths: ['/v1/billing/meter_events'] });
    try {
      const first = await sendPendingUsage({ workspaceId: ws.id, maxBatchUnits: 1 });
      expect(first.failed).toBe(2);
      // The fake finishes the slow requests after the client gave up: wait for them (up to 10 s on a
      // busy machine) rather than for a fixed time.
      for (let waited = 0; (await meterEventsOf(billing.customerId!)).length < 2 && waited < 10_000; waited += 100) {
        await new Promise((r) => setTimeout(r, 100));
      }
      expect((await meterEventsOf(billing.customerId!)).length).toBe(2);
    } finally {
      await h.control('/_fake/faults', undefined, 'DELETE');
      delete process.env.STRIPE_TIMEOUT_MS;
      resetEnvForTests();
    }
    await drain(ws.id);
    expect((await meterEventsOf(billing.customerId!)).length).toBe(2);
    expect(
      await db()('usage_events').where({ workspace_id: ws.id }).whereNull('sent_at').count({ n: '*' }).first(),
    ).toMatchObject({ n: 0 });
  });

  it('an identifier the service already has (sent outside the idempotency window) is marked sent, not sent twice', async () => {
    const { ws, billing } = await subscribed('crew');
    await screenMany(ws.slug, ws.members.planner.id, 1);
    expect(await formUsageBatches({ maxBatchUnits: MAX_BATCH_UNITS, maxBatches: 10, workspaceId: ws.id })).toEqual({
      batches: 1,
      units: 1,
    });
    const [key] = await batchIdentifiers(ws.id);
    await h.sdk.billing.meterEvents.create(
      {
        event_name: 'screened_flight',
        payload: { stripe_customer_id: billing.customerId!, value: '1' },
        identifier: key,
      },
      { idempotencyKey: `other-${key}` },
    );
    const r = await sendPendingUsage({ workspaceId: ws.id });
    expect(r).toMatchObject({ attempted: 1, alreadyRecorded: 1, failed: 0 });
    expect((await meterEventsOf(billing.customerId!)).length).toBe(1);
  });

  it('reconciliation shows units still waiting as a difference', async () => {
    const { ws, financeCookie } = await subscribed('crew');
    await screenMany(ws.slug, ws.members.planner.id, 2);
    await sendPendingUsage({ workspaceId: ws.id });
    await screenMany(ws.slug, ws.members.planner.id, 1);
    const u = await usage(ws.slug, financeCookie);
    expect(u.body).toMatchObject({ units: 3, sentUnits: 2, pendingUnits: 1 });
    expect(u.body.reconciliation).toMatchObject({ ledgerUnits: 3, providerUnits: 2, difference: 1 });
  });
});

describe('backoff', () => {
  it('doubles from the base, stays within [half, full] of it with jitter, and is capped', () => {
    expect(backoffMs(1, () => 0)).toBe(BACKOFF_BASE_MS / 2);
    expect(backoffMs(1, () => 1)).toBe(BACKOFF_BASE_MS);
    expect(backoffMs(4, () => 1)).toBe(BACKOFF_BASE_MS * 8);
    expect(backoffMs(4, () => 0)).toBe(BACKOFF_BASE_MS * 4);
    expect(backoffMs(40, () => 1)).toBe(BACKOFF_MAX_MS);
  });
});
