import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  ALL_LOOKUP_KEYS,
  METERED_PRODUCT,
  METER_EVENT_NAME,
  PLANS,
  PLAN_IDS,
  TRIAL_DAYS,
  type PlanId,
} from '../../../lib/billing/plans';
import { catalogue, customerWithCard, startHarness, type Harness } from './harness';

let h: Harness;
let prices: Map<string, Stripe.Price>;

beforeAll(async () => {
  h = await startHarness();
  prices = await catalogue(h.stripe);
});
afterAll(async () => {
  await h.close();
});

function planItems(planId: PlanId): { price: string }[] {
  const plan = PLANS[planId];
  return [{ price: prices.get(plan.baseLookupKey)!.id }, { price: prices.get(plan.meteredLookupKey)!.id }];
}

describe('test tool (local payment fake): plan catalogue created at start-up', () => {
  it('has one meter for screened flights', async () => {
    const meters = await h.stripe.billing.meters.list({ status: 'active' });
    expect(meters.data.map((m) => m.event_name)).toEqual([METER_EVENT_NAME]);
    expect(meters.data[0].default_aggregation.formula).toBe('sum');
  });

  it.each(PLAN_IDS)('plan %s: a licensed monthly base price and a metered per-flight price', async (planId) => {
    const plan = PLANS[planId];
    const meter = (await h.stripe.billing.meters.list()).data[0];
    const list = await h.stripe.prices.list({ lookup_keys: [plan.baseLookupKey, plan.meteredLookupKey] });
    const byKey = new Map(list.data.map((p) => [p.lookup_key, p]));
    const base = byKey.get(plan.baseLookupKey)!;
    const metered = byKey.get(plan.meteredLookupKey)!;
    expect(base).toMatchObject({
      currency: 'usd',
      unit_amount: plan.baseFeeCents,
      product: plan.productId,
      recurring: { interval: 'month', interval_count: 1, usage_type: 'licensed', meter: null },
    });
    expect(metered).toMatchObject({
      currency: 'usd',
      unit_amount: plan.perFlightCents,
      product: METERED_PRODUCT.id,
      recurring: { interval: 'month', usage_type: 'metered', meter: meter.id },
    });
    const product = await h.stripe.products.retrieve(plan.productId);
    expect(product.name).toContain(plan.name);
  });

  it('lists all lookup keys and nothing else', async () => {
    const list = await h.stripe.prices.list({ lookup_keys: [...ALL_LOOKUP_KEYS], limit: 100 });
    expect(list.data.map((p) => p.lookup_key).sort()).toEqual([...ALL_LOOKUP_KEYS].sort());
  });
});

describe('test tool (local payment fake): subscriptions', () => {
  it('subscribing with a 14-day trial is trialing, and sends customer.subscription.created', async () => {
    const customer = await h.stripe.customers.create({
      email: 'trial@example.test',
      metadata: { workspace: 'ws_trial' },
    });
    const before = Math.floor(Date.now() / 1000);
    const sub = await h.stripe.subscriptions.create({
      customer: customer.id,
      items: planItems('crew'),
      trial_period_days: TRIAL_DAYS,
      metadata: { workspace: 'ws_trial', plan: 'crew' },
    });
    expect(sub.status).toBe('trialing');
    expect(sub.customer).toBe(customer.id);
    expect(sub.metadata).toEqual({ workspace: 'ws_trial', plan: 'crew' });
    expect(sub.trial_end! - sub.trial_start!).toBe(TRIAL_DAYS * 86_400);
    expect(sub.trial_start!).toBeGreaterThanOrEqual(before);
    expect(sub.items.data).toHaveLength(2);
    for (const item of sub.items.data) expect(item.current_period_end).toBe(sub.trial_end);
    const metered = sub.items.data.find((i) => i.price.recurring?.usage_type === 'metered')!;
    expect(metered.quantity).toBeUndefined();

    const event = await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.created' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    expect(event.object).toBe('event');
    expect(event.id).toMatch(/^evt_/);
    expect((event.data.object as Stripe.Subscription).status).toBe('trialing');
  });

  it('subscribing without a trial, with a card, is active for one calendar month', async () => {
    const { customer, paymentMethod } = await customerWithCard(h.stripe, 'pm_card_visa');
    expect(paymentMethod.card?.last4).toBe('4242');
    const sub = await h.stripe.subscriptions.create({ customer: customer.id, items: planItems('fleet') });
    expect(sub.status).toBe('active');
    expect(sub.trial_end).toBeNull();
    const item = sub.items.data[0];
    const start = new Date(item.current_period_start * 1000);
    const end = new Date(item.current_period_end * 1000);
    const expected = new Date(start);
    expected.setUTCDate(1);
    expected.setUTCMonth(expected.getUTCMonth() + 1);
    expect(end.getUTCMonth()).toBe(expected.getUTCMonth());

    const listed = await h.stripe.subscriptions.list({ customer: customer.id });
    expect(listed.data.map((s) => s.id)).toEqual([sub.id]);
    const expanded = await h.stripe.subscriptions.retrieve(sub.id, {
      expand: ['customer', 'items.data.price.product'],
    });
    expect((expanded.customer as Stripe.Customer).email).toBe(customer.email);
    expect((expanded.items.data[0].price.product as Stripe.Product).id).toBe(PLANS.fleet.productId);
  });

  it('changing plan swaps the prices on the same items and sends customer.subscription.updated', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa');
    const sub = await h.stripe.subscriptions.create({ customer: customer.id, items: planItems('crew') });
    const base = sub.items.data.find((i) => i.price.recurring?.usage_type === 'licensed')!;
    const metered = sub.items.data.find((i) => i.price.recurring?.usage_type === 'metered')!;
    const fleet = planItems('fleet');
    const updated = await h.stripe.subscriptions.update(sub.id, {
      items: [
        { id: base.id, price: fleet[0].price },
        { id: metered.id, price: fleet[1].price },
      ],
      metadata: { plan: 'fleet' },
      proration_behavior: 'none',
    });
    expect(updated.items.data.map((i) => i.id).sort()).toEqual([base.id, metered.id].sort());
    expect(updated.items.data.map((i) => i.price.lookup_key).sort()).toEqual(
      [PLANS.fleet.baseLookupKey, PLANS.fleet.meteredLookupKey].sort(),
    );
    const event = await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.updated' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    expect(Object.keys(event.data.previous_attributes ?? {})).toEqual(expect.arrayContaining(['items', 'metadata']));
  });

  it('cancel at period end, resume, then cancel at period end and close the period: canceled', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa');
    const sub = await h.stripe.subscriptions.create({ customer: customer.id, items: planItems('crew') });
    const pending = await h.stripe.subscriptions.update(sub.id, { cancel_at_period_end: true });
    expect(pending.cancel_at_period_end).toBe(true);
    expect(pending.cancel_at).toBe(pending.items.data[0].current_period_end);
    expect(pending.status).toBe('active');
    const resumed = await h.stripe.subscriptions.update(sub.id, { cancel_at_period_end: false });
    expect(resumed.cancel_at_period_end).toBe(false);
    expect(resumed.cancel_at).toBeNull();

    await h.stripe.subscriptions.update(sub.id, { cancel_at_period_end: true });
    const { body } = await h.control<{ subscription: Stripe.Subscription; invoice: Stripe.Invoice }>('/_fake/advance', {
      subscription: sub.id,
    });
    expect(body.subscription.status).toBe('canceled');
    expect(body.invoice.status).toBe('paid');
    await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.deleted' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    const listedActive = await h.stripe.subscriptions.list({ customer: customer.id });
    expect(listedActive.data).toHaveLength(0);
    const listedAll = await h.stripe.subscriptions.list({ customer: customer.id, status: 'all' });
    expect(listedAll.data.map((s) => s.status)).toEqual(['canceled']);
  });

  it('trial_end=now ends the trial: a $0 invoice and an active subscription', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa');
    const sub = await h.stripe.subscriptions.create({
      customer: customer.id,
      items: planItems('crew'),
      trial_period_days: TRIAL_DAYS,
    });
    const ended = await h.stripe.subscriptions.update(sub.id, { trial_end: 'now', expand: ['latest_invoice'] });
    expect(ended.status).toBe('active');
    expect(ended.trial_end).toBeLessThan(sub.trial_end!);
    expect(ended.latest_invoice).toMatchObject({ object: 'invoice', amount_due: 0, status: 'paid' });
    const event = await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.updated' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    expect(event.data.previous_attributes).toMatchObject({ status: 'trialing' });
  });

  it('lists expand through data.*', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa', 'expand@example.test');
    await h.stripe.subscriptions.create({ customer: customer.id, items: planItems('fleet') });
    const list = await h.stripe.subscriptions.list({
      customer: customer.id,
      expand: ['data.customer', 'data.default_payment_method'],
    });
    expect((list.data[0].customer as Stripe.Customer).email).toBe('expand@example.test');
    const bad = await h.stripe.subscriptions
      .list({ customer: customer.id, expand: ['data.status'] })
      .catch((e: unknown) => e);
    expect(bad).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it('cancelling with DELETE ends it now and sends customer.subscription.deleted', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa');
    const sub = await h.stripe.subscriptions.create({ customer: customer.id, items: planItems('crew') });
    const canceled = await h.stripe.subscriptions.cancel(sub.id);
    expect(canceled.status).toBe('canceled');
    expect(canceled.ended_at).not.toBeNull();
    const event = await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.deleted' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    expect((event.data.object as Stripe.Subscription).status).toBe('canceled');
    await expect(h.stripe.subscriptions.update(sub.id, { cancel_at_period_end: true })).rejects.toBeInstanceOf(
      Stripe.errors.StripeInvalidRequestError,
    );
  });
});

describe('test tool (local payment fake): request validation, as the API answers it', () => {
  const cases: {
    name: string;
    call: (s: Stripe, customer: string) => Promise<unknown>;
    status: number;
    code?: string;
    param?: string;
  }[] = [
    {
      name: 'unknown price',
      call: (s, customer) => s.subscriptions.create({ customer, items: [{ price: 'price_nope' }] }),
      status: 400,
      code: 'resource_missing',
      param: 'items[0][price]',
    },
    {
      name: 'unknown customer',
      call: (s) => s.subscriptions.create({ customer: 'cus_nope', items: planItems('crew') }),
      status: 400,
      code: 'resource_missing',
      param: 'customer',
    },
    {
      name: 'quantity on a metered price',
      call: (s, customer) =>
        s.subscriptions.create({ customer, items: [{ price: planItems('crew')[1].price, quantity: 3 }] }),
      status: 400,
      param: 'items[0][quantity]',
    },
    {
      name: 'unknown parameter',
      call: (s, customer) => s.customers.update(customer, { colour: 'blue' } as Stripe.CustomerUpdateParams),
      status: 400,
      code: 'parameter_unknown',
      param: 'colour',
    },
    {
      name: 'missing object in the path',
      call: (s) => s.subscriptions.retrieve('sub_nope'),
      status: 404,
      code: 'resource_missing',
    },
  ];

  it.each(cases)('$name -> $status $code', async ({ call, status, code, param }) => {
    const customer = await h.stripe.customers.create({ email: 'v@example.test' });
    const error = await call(h.stripe, customer.id).then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    const e = error as Stripe.errors.StripeInvalidRequestError;
    expect(e.statusCode).toBe(status);
    expect(e.rawType).toBe('invalid_request_error');
    if (code) expect(e.code).toBe(code);
    if (param) expect(e.param).toBe(param);
  });

  it('customers: email, default payment method and metadata update; deleted customers read as deleted', async () => {
    const customer = await h.stripe.customers.create({ email: 'a@example.test', metadata: { a: '1', b: '2' } });
    const pm = await h.stripe.paymentMethods.attach('pm_card_visa', { customer: customer.id });
    const updated = await h.stripe.customers.update(customer.id, {
      email: 'billing@example.test',
      invoice_settings: { default_payment_method: pm.id },
      metadata: { a: '', c: '3' },
    });
    expect(updated.email).toBe('billing@example.test');
    expect(updated.invoice_settings.default_payment_method).toBe(pm.id);
    expect(updated.metadata).toEqual({ b: '2', c: '3' });
    const methods = await h.stripe.customers.listPaymentMethods(customer.id);
    expect(methods.data.map((m) => m.id)).toEqual([pm.id]);
    await h.stripe.customers.del(customer.id);
    const gone = await h.stripe.customers.retrieve(customer.id);
    expect(gone.deleted).toBe(true);
  });
});
