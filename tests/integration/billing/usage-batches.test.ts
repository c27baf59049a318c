import { describe, expect, it } from 'vitest';
import type Stripe from 'stripe';
import { apiRequest, call, makeWorkspace, sessionCookie, TEST_ORIGIN } from '../../support/test-db';
import { db } from '@/db/client';
import { getBilling } from '@/db/billing';
import { recordUsage } from '@/db/usage';
import { formUsageBatches } from '@/db/usage-batches';
import { reconcileUsage } from '@/lib/billing/reconcile';
import { MAX_BATCH_UNITS, sendPendingUsage } from '@/lib/billing/usage-sender';
import { meterId } from '@/lib/billing/catalogue';
import { estimateChargeCents } from '@/lib/billing/plans';
import * as subscriptionRoute from '@/app/api/v1/workspaces/[slug]/billing/subscription/route';
import type { FakeState } from '@/lib/fakes/payment/server';
import { useBillingHarness } from './harness';

const h = useBillingHarness();

const MINUTE_MS = 60_000;

/** The subscription's webhooks rewrite the period; wait until the fake has sent them all. */
async function webhooksSettled(): Promise<void> {
  let seen = -1;
  while (seen !== h.deliveries.length) {
    seen = h.deliveries.length;
    await new Promise((r) => setTimeout(r, 300));
  }
}

/**
 * A subscribed workspace whose period and metering started `minutesAgo` minutes back, so ledger rows
 * dated over the last minutes are billable and inside the period.
 */
async function subscribed(minutesAgo = 10) {
  const ws = await makeWorkspace(['billing']);
  await db()('workspace_billing')
    .where({ workspace_id: ws.id })
    .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString() });
  const cookie = await sessionCookie(ws.members.billing.id);
  const r = await call(
    subscriptionRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/subscription`, {
      cookie,
      body: { planId: 'crew', card: 'succeeds' },
      origin: TEST_ORIGIN,
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(201);
  await webhooksSettled();
  const start = new Date(Math.floor((Date.now() - minutesAgo * MINUTE_MS) / MINUTE_MS) * MINUTE_MS).toISOString();
  await db()('workspace_billing')
    .where({ workspace_id: ws.id })
    .update({ metered_since: start, current_period_start: start });
  return { ws, billing: (await getBilling({ workspaceId: ws.id }))! };
}

/**
 * `n` ledger units as an import's flights would leave them, one per source id, dated evenly over the
 * `spanMs` up to a second ago, with source ids no other call uses. Written straight to the ledger (through `recordUsage`, as the import
 * worker does) so a 100 000-row import's usage is there in seconds.
 */
let nextSource = 1_000_000;
async function ledgerUnits(workspaceId: number, n: number, spanMs: number): Promise<void> {
  const firstSource = nextSource;
  nextSource += n;
  const end = Date.now() - 1000;
  const chunk = 2_000;
  for (let from = 0; from < n; from += chunk) {
    await db().transaction(async (trx) => {
      for (let i = from; i < Math.min(n, from + chunk); i++) {
        const occurredAt = new Date(end - spanMs + Math.floor((i * spanMs) / n)).toISOString();
        await recordUsage(trx, { workspaceId, kind: 'imported_flight', sourceId: firstSource + i, occurredAt });
      }
    });
  }
}

async function meterEventsOf(customerId: string) {
  const { body } = await h.control<FakeState>('/_fake/state');
  return body.meterEvents.filter((e) => e.customer === customerId);
}

async function unsentRows(workspaceId: number): Promise<number> {
  const r = await db()('usage_events')
    .where({ workspace_id: workspaceId })
    .whereNull('sent_at')
    .count({ n: '*' })
    .first();
  return Number(r?.n ?? 0);
}

/** Ledger units per UTC minute, keyed by the minute's start in seconds. */
async function ledgerByMinute(workspaceId: number): Promise<Map<number, number>> {
  const rows = (await db()('usage_events').where({ workspace_id: workspaceId }).select('occurred_at', 'quantity')) as {
    occurred_at: string;
    quantity: number;
  }[];
  const m = new Map<number, number>();
  for (const r of rows) {
    const minute = Math.floor(Date.parse(r.occurred_at) / MINUTE_MS) * 60;
    m.set(minute, (m.get(minute) ?? 0) + Number(r.quantity));
  }
  return m;
}

describe('aggregated meter events', () => {
  it(
    'a 100 000-flight import is counted by the payment service within a minute, in a few dozen events, exactly',
    { timeout: 240_000 },
    async () => {
      const { ws, billing } = await subscribed(10);
      const units = 100_000;
      await ledgerUnits(ws.id, units, 5 * MINUTE_MS);

      const started = Date.now();
      let passes = 0;
      while ((await unsentRows(ws.id)) > 0 && Date.now() - started < 120_000) {
        await sendPendingUsage();
        passes += 1;
      }
      const seconds = (Date.now() - started) / 1000;
      console.info(`[usage-batches] ${units} units delivered in ${seconds.toFixed(1)} s over ${passes} sender passes`);
      expect(await unsentRows(ws.id)).toBe(0);
      expect(seconds).toBeLessThan(60);

      const events = await meterEventsOf(billing.customerId!);
      // Six UTC minutes at most, each cut into events of at most MAX_BATCH_UNITS units.
      expect(events.length).toBeLessThanOrEqual(6 + Math.ceil(units / MAX_BATCH_UNITS));
      expect(events.every((e) => e.value > 1 && e.value <= MAX_BATCH_UNITS)).toBe(true);
      expect(events.reduce((s, e) => s + e.value, 0)).toBe(units);
      const batches = (await db()('usage_batches').where({ workspace_id: ws.id }).select('identifier', 'quantity')) as {
        identifier: string;
        quantity: number;
      }[];
      expect(new Map(events.map((e) => [e.identifier, e.value]))).toEqual(
        new Map(batches.map((b) => [b.identifier, Number(b.quantity)])),
      );
      const perRow = (await db()('usage_events')
        .where({ workspace_id: ws.id })
        .whereNull('batch_id')
        .count({ n: '*' })
        .first()) as { n: number | string };
      expect(Number(perRow.n)).toBe(0);

      // Every minute-aligned window the service summarises holds the ledger's units for that minute.
      const meter = await meterId();
      for (const [minute, ledger] of await ledgerByMinute(ws.id)) {
        const summaries = await h.sdk.billing.meters.listEventSummaries(meter, {
          customer: billing.customerId!,
          start_time: minute,
          end_time: minute + 60,
        });
        expect(summaries.data[0]?.aggregated_value, `minute ${new Date(minute * 1000).toISOString()}`).toBe(ledger);
      }
      const rec = await reconcileUsage({ workspaceId: ws.id });
      expect(rec).toMatchObject({ ledgerUnits: units, providerUnits: units, difference: 0 });
      const { body } = await h.control<{ invoice: Stripe.Invoice }>('/_fake/advance', {
        subscription: billing.subscriptionId,
      });
      expect(body.invoice.amount_due).toBe(estimateChargeCents('crew', units));
    },
  );

  it('a batch never spans two minutes or two workspaces, and holds at most the batch size', async () => {
    const a = await subscribed(5);
    const b = await subscribed(5);
    await ledgerUnits(a.ws.id, 40, 3 * MINUTE_MS);
    await ledgerUnits(b.ws.id, 25, 2 * MINUTE_MS);
    const formed = await formUsageBatches({ maxBatchUnits: 7, maxBatches: 100 });
    expect(formed.units).toBeGreaterThanOrEqual(65);
    for (const ws of [a.ws, b.ws]) {
      const rows = (await db()('usage_events as u')
        .join('usage_batches as ub', 'ub.id', 'u.batch_id')
        .where('u.workspace_id', ws.id)
        .select('u.occurred_at', 'ub.id', 'ub.workspace_id', 'ub.quantity', 'ub.occurred_at as batch_at')) as {
        occurred_at: string;
        id: number;
        workspace_id: number;
        quantity: number;
        batch_at: string;
      }[];
      expect(rows.length).toBe(ws.id === a.ws.id ? 40 : 25);
      const byBatch = new Map<number, typeof rows>();
      for (const r of rows) byBatch.set(r.id, [...(byBatch.get(r.id) ?? []), r]);
      for (const [, members] of byBatch) {
        expect(new Set(members.map((m) => m.occurred_at.slice(0, 16))).size).toBe(1);
        expect(members.every((m) => Number(m.workspace_id) === ws.id)).toBe(true);
        expect(members.length).toBe(Number(members[0].quantity));
        expect(members.length).toBeLessThanOrEqual(7);
        // The event's time is its latest unit's, inside the same minute.
        expect(members[0].batch_at).toBe(
          members
            .map((m) => m.occurred_at)
            .sort()
            .at(-1),
        );
      }
    }
  });

  it('a billing period ending inside a minute splits that minute: the units before the end are stamped before it', async () => {
    const { ws } = await subscribed(5);
    const minute = Math.floor((Date.now() - 2 * MINUTE_MS) / MINUTE_MS) * MINUTE_MS;
    const end = new Date(minute + 30_000).toISOString();
    await db()('workspace_billing').where({ workspace_id: ws.id }).update({ current_period_end: end });
    await db().transaction(async (trx) => {
      for (const [i, offsetMs] of [10_000, 12_000, 29_900, 30_000, 45_000].entries()) {
        await recordUsage(trx, {
          workspaceId: ws.id,
          kind: 'imported_flight',
          sourceId: nextSource + i,
          occurredAt: new Date(minute + offsetMs).toISOString(),
        });
      }
    });
    nextSource += 5;
    await formUsageBatches({ maxBatchUnits: MAX_BATCH_UNITS, maxBatches: 10, workspaceId: ws.id });
    const batches = (await db()('usage_batches')
      .where({ workspace_id: ws.id })
      .orderBy('id')
      .select('quantity', 'occurred_at')) as { quantity: number; occurred_at: string }[];
    expect(batches.map((b) => [Number(b.quantity), b.occurred_at])).toEqual([
      [3, new Date(minute + 29_900).toISOString()],
      [2, new Date(minute + 45_000).toISOString()],
    ]);
    expect(batches[0].occurred_at < end).toBe(true);
  });

  it('two senders racing put each row in one batch and the service counts each unit once', async () => {
    const { ws, billing } = await subscribed(5);
    await ledgerUnits(ws.id, 500, 2 * MINUTE_MS);
    await Promise.all([
      sendPendingUsage({ maxBatchUnits: 50 }),
      sendPendingUsage({ maxBatchUnits: 50 }),
      sendPendingUsage({ maxBatchUnits: 50 }),
    ]);
    while ((await unsentRows(ws.id)) > 0) await sendPendingUsage({ maxBatchUnits: 50 });
    const events = await meterEventsOf(billing.customerId!);
    expect(new Set(events.map((e) => e.identifier)).size).toBe(events.length);
    expect(events.reduce((s, e) => s + e.value, 0)).toBe(500);
    expect(await reconcileUsage({ workspaceId: ws.id })).toMatchObject({
      ledgerUnits: 500,
      providerUnits: 500,
      difference: 0,
    });
  });
});

describe('idempotent replay', () => {
  it('a crash after the service counted a batch but before it was marked: the resend is recognised, nothing is counted twice', async () => {
    const { ws, billing } = await subscribed(5);
    await ledgerUnits(ws.id, 120, 90_000);
    await formUsageBatches({ maxBatchUnits: 50, maxBatches: 100 });
    const batches = (await db()('usage_batches')
      .where({ workspace_id: ws.id })
      .orderBy('id')
      .select('identifier', 'quantity')) as { identifier: string; quantity: number }[];
    expect(batches.length).toBeGreaterThanOrEqual(3);
    // What the sender does before it marks the batch sent: the event, with the batch's identifier as its idempotency key.
    for (const b of batches.slice(0, 2)) {
      await h.sdk.billing.meterEvents.create(
        {
          event_name: 'screened_flight',
          payload: { stripe_customer_id: billing.customerId!, value: String(b.quantity) },
          identifier: b.identifier,
        },
        { idempotencyKey: b.identifier },
      );
    }
    const r = await sendPendingUsage({ workspaceId: ws.id });
    expect(r).toMatchObject({
      attempted: batches.length,
      alreadyRecorded: 2,
      sent: batches.length - 2,
      failed: 0,
      unitsDelivered: 120,
    });
    expect(await unsentRows(ws.id)).toBe(0);
    const events = await meterEventsOf(billing.customerId!);
    expect(events.length).toBe(batches.length);
    expect(events.reduce((s, e) => s + e.value, 0)).toBe(120);
  });

  it('units recorded after a batch was formed go into a later batch, never into one already sent', async () => {
    const { ws, billing } = await subscribed(5);
    await ledgerUnits(ws.id, 10, 1_000);
    await sendPendingUsage({ workspaceId: ws.id });
    const first = (await db()('usage_batches').where({ workspace_id: ws.id }).select('id', 'quantity', 'sent_at')) as {
      id: number;
      quantity: number;
      sent_at: string | null;
    }[];
    expect(first.every((b) => b.sent_at !== null)).toBe(true);
    await ledgerUnits(ws.id, 5, 1_000);
    const second = await sendPendingUsage({ workspaceId: ws.id });
    expect(second).toMatchObject({ batchedUnits: 5, unitsDelivered: 5 });
    const later = (await db()('usage_batches').where({ workspace_id: ws.id }).select('id', 'quantity')) as {
      id: number;
      quantity: number;
    }[];
    for (const b of first) expect(later.find((l) => l.id === b.id)?.quantity).toBe(b.quantity);
    const events = await meterEventsOf(billing.customerId!);
    expect(events.length).toBe(later.length);
    expect(events.reduce((s, e) => s + e.value, 0)).toBe(15);
    expect(await reconcileUsage({ workspaceId: ws.id })).toMatchObject({
      ledgerUnits: 15,
      providerUnits: 15,
      difference: 0,
    });
  });
});

describe('upgrading from one event per ledger row', () => {
  it('rows left unsent by the per-row sender keep their own identifier, so one it had already delivered is not counted again', async () => {
    const { ws, billing } = await subscribed(5);
    const migration = '20261203010000_usage_batches.ts';
    await db().migrate.down({ name: migration });
    try {
      await db().transaction(async (trx) => {
        for (const sourceId of [9_000_001, 9_000_002, 9_000_003]) {
          await trx('usage_events').insert({
            workspace_id: ws.id,
            kind: 'imported_flight',
            source_id: sourceId,
            idempotency_key: `tp-imported_flight-${sourceId}`,
            quantity: 1,
            occurred_at: new Date(Date.now() - 30_000).toISOString(),
          });
        }
      });
      // The per-row sender got the first row through and was killed before marking it sent.
      await h.sdk.billing.meterEvents.create(
        {
          event_name: 'screened_flight',
          payload: { stripe_customer_id: billing.customerId!, value: '1' },
          identifier: 'tp-imported_flight-9000001',
        },
        { idempotencyKey: 'tp-imported_flight-9000001' },
      );
    } finally {
      await db().migrate.up({ name: migration });
    }
    const legacy = (await db()('usage_batches')
      .where({ workspace_id: ws.id })
      .orderBy('identifier')
      .select('identifier', 'quantity')) as { identifier: string; quantity: number }[];
    expect(legacy).toEqual([1, 2, 3].map((i) => ({ identifier: `tp-imported_flight-900000${i}`, quantity: 1 })));
    await ledgerUnits(ws.id, 4, 1_000);
    const r = await sendPendingUsage({ workspaceId: ws.id });
    expect(r).toMatchObject({ alreadyRecorded: 1, failed: 0, unitsDelivered: 7 });
    const events = await meterEventsOf(billing.customerId!);
    expect(events.reduce((s, e) => s + e.value, 0)).toBe(7);
    expect(await reconcileUsage({ workspaceId: ws.id })).toMatchObject({
      ledgerUnits: 7,
      providerUnits: 7,
      difference: 0,
    });
  });
});
