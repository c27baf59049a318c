import Stripe from 'stripe';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { ALL_LOOKUP_KEYS, METER_EVENT_NAME, PLANS } from '../../../lib/billing/plans';
import type { FakeState } from '../../../lib/fakes/payment/server';
import { API_KEY, catalogue, customerWithCard, sdkFor, startHarness, type Harness } from './harness';

async function subscribeCrew(h: Harness, customer: string): Promise<Stripe.Subscription> {
  const prices = await catalogue(h.stripe);
  return h.stripe.subscriptions.create({
    customer,
    items: [
      { price: prices.get(PLANS.crew.baseLookupKey)!.id },
      { price: prices.get(PLANS.crew.meteredLookupKey)!.id },
    ],
  });
}

describe('test tool (local payment fake): authentication', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h.close();
  });

  it.each([
    { name: 'a wrong test key', key: 'sk_test_wrong' },
    { name: 'a live key', key: 'sk_live_tropopass' },
  ])('$name is a 401 StripeAuthenticationError', async ({ key }) => {
    const error = await sdkFor(h.fake, key)
      .customers.list()
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(error).toMatchObject({ statusCode: 401 });
  });

  it('no Authorization header is a 401 with the error shape', async () => {
    const res = await fetch(`${h.fake.url}/v1/customers`);
    expect(res.status).toBe(401);
    const body = (await res.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe('invalid_request_error');
    expect(body.error.message).toMatch(/API key/);
  });

  it('an unknown URL is a 404 StripeInvalidRequestError', async () => {
    const error = await h.stripe.rawRequest('GET', '/v1/charges', {}).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error).toMatchObject({ statusCode: 404 });
  });

  it('the key configured is the only one accepted', async () => {
    await expect(sdkFor(h.fake, API_KEY).customers.list()).resolves.toMatchObject({ object: 'list' });
  });
});

describe('test tool (local payment fake): restart', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h.close();
  });

  it('a new fake on the same SQLite file keeps every object, the catalogue once, and idempotent replays', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa', 'persist@example.test');
    const sub = await subscribeCrew(h, customer.id);
    const event = await h.stripe.billing.meterEvents.create(
      {
        event_name: METER_EVENT_NAME,
        payload: { stripe_customer_id: customer.id, value: '5' },
        identifier: 'persist_1',
      },
      { idempotencyKey: 'persist_key_1' },
    );
    const { body: advanced } = await h.control<{ invoice: Stripe.Invoice }>('/_fake/advance', { subscription: sub.id });
    const oldPort = h.fake.port;

    await h.restart();
    expect(h.fake.port).not.toBe(oldPort);

    expect((await h.stripe.customers.retrieve(customer.id)) as Stripe.Customer).toMatchObject({
      email: 'persist@example.test',
    });
    const again = await h.stripe.subscriptions.retrieve(sub.id);
    expect(again.status).toBe('active');
    expect(again.latest_invoice).toBe(advanced.invoice.id);
    const invoice = await h.stripe.invoices.retrieve(advanced.invoice.id);
    expect(invoice.amount_due).toBe(advanced.invoice.amount_due);
    expect(invoice.hosted_invoice_url).toBe(`${h.fake.url}/_fake/invoices/${invoice.id}`);

    const replay = await h.stripe.billing.meterEvents.create(
      {
        event_name: METER_EVENT_NAME,
        payload: { stripe_customer_id: customer.id, value: '5' },
        identifier: 'persist_1',
      },
      { idempotencyKey: 'persist_key_1' },
    );
    expect(replay).toEqual(event);
    await expect(
      h.stripe.billing.meterEvents.create({
        event_name: METER_EVENT_NAME,
        payload: { stripe_customer_id: customer.id, value: '5' },
        identifier: 'persist_1',
      }),
    ).rejects.toMatchObject({ code: 'resource_already_exists' });

    const keyed = await h.stripe.prices.list({ lookup_keys: [...ALL_LOOKUP_KEYS], limit: 100 });
    expect(keyed.data).toHaveLength(ALL_LOOKUP_KEYS.length);
    expect((await h.stripe.billing.meters.list()).data).toHaveLength(1);
  });

  it('reset wipes the state but recreates the catalogue', async () => {
    await h.stripe.customers.create({ email: 'wipe@example.test' });
    const { status } = await h.control('/_fake/reset', {});
    expect(status).toBe(200);
    const { body } = await h.control<FakeState>('/_fake/state');
    expect(body.customers).toHaveLength(0);
    expect(body.subscriptions).toHaveLength(0);
    expect(body.prices.filter((p) => p.lookup_key !== null)).toHaveLength(ALL_LOOKUP_KEYS.length);
    expect(body.meters).toHaveLength(1);
  });
});

describe('test tool (local payment fake): webhook delivery', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness({ webhookRetryDelaysMs: [100, 200, 400, 800] });
  });
  afterEach(() => {
    h.receiver.downStatus = null;
  });
  afterAll(async () => {
    await h.close();
  });

  it('events carry the API shape and verify with constructEvent', async () => {
    const customer = await h.stripe.customers.create({ email: 'hook@example.test' });
    const sub = await subscribeCrew(h, customer.id);
    const event = await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.created' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    expect(event).toMatchObject({ object: 'event', livemode: false, api_version: expect.any(String) as string });
    expect(event.created).toBeGreaterThan(0);
    expect(event.request?.idempotency_key).toMatch(/^stripe-node-retry-/);
    const stored = await h.stripe.events.retrieve(event.id);
    expect(stored.type).toBe('customer.subscription.created');
  });

  it('retries with backoff while the app is down, and records every attempt', async () => {
    h.receiver.downStatus = 503;
    const customer = await h.stripe.customers.create({ email: 'down@example.test' });
    const sub = await subscribeCrew(h, customer.id);
    while (h.receiver.refused < 2) await new Promise((resolve) => setTimeout(resolve, 10));
    h.receiver.downStatus = null;
    const event = await h.receiver.waitFor(
      (e) => e.type === 'customer.subscription.created' && (e.data.object as Stripe.Subscription).id === sub.id,
    );
    await h.fake.webhooksIdle();
    const { body } = await h.control<FakeState>('/_fake/state');
    const attempts = body.deliveries.filter((d) => d.eventId === event.id);
    expect(attempts.length).toBeGreaterThanOrEqual(3);
    expect(attempts.slice(0, -1).every((a) => a.status === 503)).toBe(true);
    expect(attempts[attempts.length - 1].status).toBe(200);
    expect(attempts.map((a) => a.attempt)).toEqual(attempts.map((_, i) => i + 1));
    expect(body.events.find((e) => e.id === event.id)?.deliveryStatus).toBe('delivered');
  });

  it('gives up after the last retry; resend replays the same event id', async () => {
    h.receiver.downStatus = 500;
    const customer = await h.stripe.customers.create({ email: 'gaveup@example.test' });
    const sub = await subscribeCrew(h, customer.id);
    await h.fake.webhooksIdle();
    const { body } = await h.control<FakeState>('/_fake/state');
    const created = body.events.filter((e) => e.type === 'customer.subscription.created').at(-1)!;
    expect(created.deliveryStatus).toBe('failed');
    expect(body.deliveries.filter((d) => d.eventId === created.id)).toHaveLength(5);

    h.receiver.downStatus = null;
    for (let i = 0; i < 3; i++) {
      const resent = await h.control<{ delivered: boolean; status: number }>('/_fake/webhooks/resend', {
        eventId: created.id,
      });
      expect(resent.body).toMatchObject({ delivered: true, status: 200 });
    }
    const copies = h.receiver.events.filter((e) => e.id === created.id);
    expect(copies).toHaveLength(3);
    expect((copies[0].data.object as Stripe.Subscription).id).toBe(sub.id);
  });
});

describe('test tool (local payment fake): webhook signatures and restarts', () => {
  it('events signed with another secret are refused by the receiver', async () => {
    const h = await startHarness({ webhookSecret: 'whsec_not_the_apps_secret', webhookRetryDelaysMs: [] });
    try {
      const customer = await h.stripe.customers.create({ email: 'sig@example.test' });
      await subscribeCrew(h, customer.id);
      await h.fake.webhooksIdle();
      expect(h.receiver.rejected).toBe(1);
      expect(h.receiver.events).toHaveLength(0);
    } finally {
      await h.close();
    }
  });

  it('an event still pending when the fake stops is sent after it starts again', async () => {
    const h = await startHarness({ webhookRetryDelaysMs: [60_000] });
    try {
      h.receiver.downStatus = 503;
      const customer = await h.stripe.customers.create({ email: 'pending@example.test' });
      const sub = await subscribeCrew(h, customer.id);
      while (h.receiver.refused < 1) await new Promise((resolve) => setTimeout(resolve, 10));
      await h.fake.close();
      h.receiver.downStatus = null;
      await h.restart();
      const event = await h.receiver.waitFor(
        (e) => e.type === 'customer.subscription.created' && (e.data.object as Stripe.Subscription).id === sub.id,
      );
      expect(event.id).toMatch(/^evt_/);
    } finally {
      await h.close();
    }
  });

  it('without a webhook URL events are recorded, not sent', async () => {
    const h = await startHarness({ webhookUrl: null });
    try {
      const customer = await h.stripe.customers.create({ email: 'quiet@example.test' });
      await subscribeCrew(h, customer.id);
      await h.fake.webhooksIdle();
      const { body } = await h.control<FakeState>('/_fake/state');
      expect(body.events.map((e) => e.deliveryStatus)).toEqual(['skipped']);
      expect(body.deliveries).toHaveLength(0);
      expect(h.receiver.events).toHaveLength(0);
    } finally {
      await h.close();
    }
  });
});
