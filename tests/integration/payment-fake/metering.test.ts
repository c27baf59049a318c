import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  METER_EVENT_NAME,
  PLANS,
  PLAN_IDS,
  TRIAL_DAYS,
  estimateChargeCents,
  type PlanId,
} from '../../../lib/billing/plans';
import type { FakeState } from '../../../lib/fakes/payment/server';
import { catalogue, customerWithCard, startHarness, type Harness } from './harness';

let h: Harness;
let prices: Map<string, Stripe.Price>;
let meter: Stripe.Billing.Meter;

beforeAll(async () => {
  h = await startHarness();
  prices = await catalogue(h.stripe);
  meter = (await h.stripe.billing.meters.list()).data[0];
});
afterAll(async () => {
  await h.close();
});

async function subscribe(planId: PlanId, trial = false) {
  const { customer } = await customerWithCard(h.stripe, 'pm_card_visa');
  const plan = PLANS[planId];
  const sub = await h.stripe.subscriptions.create({
    customer: customer.id,
    items: [{ price: prices.get(plan.baseLookupKey)!.id }, { price: prices.get(plan.meteredLookupKey)!.id }],
    ...(trial ? { trial_period_days: TRIAL_DAYS } : {}),
  });
  return { customer, sub };
}

let counter = 0;
async function screenFlights(customerId: string, values: number[]) {
  for (const value of values) {
    counter += 1;
    await h.stripe.billing.meterEvents.create({
      event_name: METER_EVENT_NAME,
      payload: { stripe_customer_id: customerId, value: String(value) },
      identifier: `ledger_${customerId}_${counter}`,
    });
  }
}

async function advance(subscription: string) {
  const { status, body } = await h.control<{ subscription: Stripe.Subscription; invoice: Stripe.Invoice }>(
    '/_fake/advance',
    {
      subscription,
    },
  );
  expect(status).toBe(200);
  return body;
}

function lineFor(
  invoice: Stripe.Invoice,
  usage: 'licensed' | 'metered',
  sub: Stripe.Subscription,
): Stripe.InvoiceLineItem {
  const item = sub.items.data.find((i) => i.price.recurring?.usage_type === usage)!;
  return invoice.lines.data.find((l) => l.parent?.subscription_item_details?.subscription_item === item.id)!;
}

describe('test tool (local payment fake): meter events -> invoice', () => {
  it.each(PLAN_IDS.flatMap((planId) => [0, 7, 250].map((units) => ({ planId, units }))))(
    '$planId, $units screened flights: amount due = base fee + units x per-flight price',
    async ({ planId, units }) => {
      const { customer, sub } = await subscribe(planId);
      const values = units === 0 ? [] : [1, 1, units - 2];
      await screenFlights(customer.id, values);
      const { invoice, subscription } = await advance(sub.id);

      const expected = estimateChargeCents(planId, units);
      expect(invoice.amount_due).toBe(expected);
      expect(invoice.total).toBe(expected);
      expect(invoice.status).toBe('paid');
      expect(invoice.amount_paid).toBe(expected);
      expect(invoice.amount_remaining).toBe(0);
      expect(invoice.customer).toBe(customer.id);
      expect(invoice.parent?.subscription_details?.subscription).toBe(sub.id);
      expect(lineFor(invoice, 'licensed', sub).amount).toBe(PLANS[planId].baseFeeCents);
      const metered = lineFor(invoice, 'metered', sub);
      expect(metered.quantity).toBe(units);
      expect(metered.amount).toBe(units * PLANS[planId].perFlightCents);
      expect(subscription.status).toBe('active');
      expect(subscription.latest_invoice).toBe(invoice.id);

      const fetched = await h.stripe.invoices.retrieve(invoice.id);
      expect(fetched.amount_due).toBe(expected);
      const paid = await h.receiver.waitFor(
        (e) => e.type === 'invoice.paid' && (e.data.object as Stripe.Invoice).id === invoice.id,
      );
      expect((paid.data.object as Stripe.Invoice).amount_paid).toBe(expected);
    },
  );

  it('each period bills only its own units; the trial period is free', async () => {
    const { customer, sub } = await subscribe('crew', true);
    await screenFlights(customer.id, [3]);
    const trial = await advance(sub.id);
    expect(trial.invoice.amount_due).toBe(0);
    expect(trial.invoice.status).toBe('paid');
    expect(trial.subscription.status).toBe('active');
    expect(lineFor(trial.invoice, 'metered', sub).quantity).toBe(3);

    await screenFlights(customer.id, [2, 2]);
    const first = await advance(sub.id);
    expect(first.invoice.amount_due).toBe(estimateChargeCents('crew', 4));
    expect(first.invoice.period_start).toBe(trial.invoice.period_end);

    await screenFlights(customer.id, [5]);
    const second = await advance(sub.id);
    expect(second.invoice.amount_due).toBe(estimateChargeCents('crew', 5));

    const listed = await h.stripe.invoices.list({ subscription: sub.id });
    expect(listed.data.map((i) => i.id)).toEqual([second.invoice.id, first.invoice.id, trial.invoice.id]);
    const byCustomer = await h.stripe.invoices.list({ customer: customer.id, status: 'paid' });
    expect(byCustomer.data).toHaveLength(3);
    expect(new Set(listed.data.map((i) => i.number)).size).toBe(3);
  });

  it('the invoice preview shows the open period so far', async () => {
    const { customer, sub } = await subscribe('fleet');
    await screenFlights(customer.id, [4, 6]);
    const preview = await h.stripe.invoices.createPreview({ subscription: sub.id });
    expect(preview.amount_due).toBe(estimateChargeCents('fleet', 10));
    expect(preview.status).toBe('draft');
    const { invoice } = await advance(sub.id);
    expect(invoice.amount_due).toBe(preview.amount_due);
  });

  it('event summaries give the meter total for reconciliation', async () => {
    const { customer, sub } = await subscribe('crew');
    await screenFlights(customer.id, [1, 2, 3, 4]);
    const start = Math.floor(sub.items.data[0].current_period_start / 60) * 60;
    const end = (Math.floor(Date.now() / 1000 / 60) + 1) * 60;
    const summaries = await h.stripe.billing.meters.listEventSummaries(meter.id, {
      customer: customer.id,
      start_time: start,
      end_time: end,
    });
    expect(summaries.data).toHaveLength(1);
    expect(summaries.data[0]).toMatchObject({
      object: 'billing.meter_event_summary',
      aggregated_value: 10,
      meter: meter.id,
    });

    const hourly = await h.stripe.billing.meters.listEventSummaries(meter.id, {
      customer: customer.id,
      start_time: Math.floor(start / 3600) * 3600,
      end_time: (Math.floor(end / 3600) + 1) * 3600,
      value_grouping_window: 'hour',
    });
    expect(hourly.data.reduce((sum, s) => sum + s.aggregated_value, 0)).toBe(10);

    await expect(
      h.stripe.billing.meters.listEventSummaries(meter.id, {
        customer: customer.id,
        start_time: start + 1,
        end_time: end,
      }),
    ).rejects.toMatchObject({ statusCode: 400, param: 'start_time' });
  });
});

describe('test tool (local payment fake): meter event rules', () => {
  it('a duplicate identifier is refused with 400 and counted once', async () => {
    const { customer } = await subscribe('crew');
    const params = {
      event_name: METER_EVENT_NAME,
      payload: { stripe_customer_id: customer.id, value: '1' },
      identifier: `dup_${customer.id}`,
    };
    const first = await h.stripe.billing.meterEvents.create(params);
    expect(first).toMatchObject({
      object: 'billing.meter_event',
      identifier: params.identifier,
      payload: params.payload,
    });
    const error = await h.stripe.billing.meterEvents.create(params).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error).toMatchObject({ statusCode: 400, code: 'resource_already_exists', param: 'identifier' });
    const { body } = await h.control<FakeState>('/_fake/state');
    expect(body.meterEvents.filter((e) => e.identifier === params.identifier)).toHaveLength(1);
  });

  const now = () => Math.floor(Date.now() / 1000);
  it.each([
    { name: '34 days ago is accepted', offset: -34 * 86_400, code: null },
    { name: '36 days ago is refused', offset: -36 * 86_400, code: 'timestamp_too_far_in_past' },
    { name: '4 minutes ahead is accepted', offset: 240, code: null },
    { name: '10 minutes ahead is refused', offset: 600, code: 'timestamp_in_future' },
  ])('timestamp $name', async ({ offset, code }) => {
    const customer = await h.stripe.customers.create({ email: 'ts@example.test' });
    const call = h.stripe.billing.meterEvents.create({
      event_name: METER_EVENT_NAME,
      payload: { stripe_customer_id: customer.id, value: '1' },
      timestamp: now() + offset,
    });
    if (code === null) await expect(call).resolves.toMatchObject({ object: 'billing.meter_event' });
    else await expect(call).rejects.toMatchObject({ statusCode: 400, code, param: 'timestamp' });
  });

  it.each([
    {
      name: 'unknown event name',
      payload: (c: string) => ({ stripe_customer_id: c, value: '1' }),
      event: 'nope',
      param: 'event_name',
    },
    {
      name: 'unknown customer',
      payload: () => ({ stripe_customer_id: 'cus_nope', value: '1' }),
      event: METER_EVENT_NAME,
      param: 'payload[stripe_customer_id]',
    },
    {
      name: 'missing value',
      payload: (c: string) => ({ stripe_customer_id: c }),
      event: METER_EVENT_NAME,
      param: 'payload[value]',
    },
    {
      name: 'fractional value',
      payload: (c: string) => ({ stripe_customer_id: c, value: '1.5' }),
      event: METER_EVENT_NAME,
      param: 'payload[value]',
    },
  ])('$name is refused naming $param', async ({ payload, event, param }) => {
    const customer = await h.stripe.customers.create({ email: 'bad@example.test' });
    await expect(
      h.stripe.billing.meterEvents.create({ event_name: event, payload: payload(customer.id) }),
    ).rejects.toMatchObject({ statusCode: 400, param });
  });
});

describe('test tool (local payment fake): Idempotency-Key', () => {
  it('same key and same body replays the stored response without doing the work again', async () => {
    const customer = await h.stripe.customers.create({ email: 'idem@example.test' });
    const params = {
      event_name: METER_EVENT_NAME,
      payload: { stripe_customer_id: customer.id, value: '2' },
      identifier: `idem_${customer.id}`,
    };
    const first = await h.stripe.billing.meterEvents.create(params, { idempotencyKey: `key_${customer.id}` });
    const again = await h.stripe.billing.meterEvents.create(params, { idempotencyKey: `key_${customer.id}` });
    expect(again).toEqual(first);
    expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
    const { body } = await h.control<FakeState>('/_fake/state');
    expect(body.meterEvents.filter((e) => e.customer === customer.id)).toHaveLength(1);

    const c1 = await h.stripe.customers.create(
      { email: 'one@example.test' },
      { idempotencyKey: `cust_${customer.id}` },
    );
    const c2 = await h.stripe.customers.create(
      { email: 'one@example.test' },
      { idempotencyKey: `cust_${customer.id}` },
    );
    expect(c2.id).toBe(c1.id);
  });

  it('same key with a different body is an idempotency_error', async () => {
    const customer = await h.stripe.customers.create({ email: 'idem2@example.test' });
    const key = `key2_${customer.id}`;
    await h.stripe.billing.meterEvents.create(
      { event_name: METER_EVENT_NAME, payload: { stripe_customer_id: customer.id, value: '1' } },
      { idempotencyKey: key },
    );
    const error = await h.stripe.billing.meterEvents
      .create(
        { event_name: METER_EVENT_NAME, payload: { stripe_customer_id: customer.id, value: '9' } },
        { idempotencyKey: key },
      )
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(error).toMatchObject({ statusCode: 400, rawType: 'idempotency_error' });
  });

  it('every POST from the SDK carries its own key', async () => {
    const a = await h.stripe.customers.create({ email: 'k1@example.test' });
    const b = await h.stripe.customers.create({ email: 'k1@example.test' });
    expect(a.id).not.toBe(b.id);
    expect(a.lastResponse.idempotencyKey).toMatch(/^stripe-node-retry-/);
    expect(a.lastResponse.idempotencyKey).not.toBe(b.lastResponse.idempotencyKey);
  });
});
