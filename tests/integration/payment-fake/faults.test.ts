import Stripe from 'stripe';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { METER_EVENT_NAME } from '../../../lib/billing/plans';
import type { FakeState } from '../../../lib/fakes/payment/server';
import { startHarness, type Harness } from './harness';

let h: Harness;
let meter: Stripe.Billing.Meter;

beforeAll(async () => {
  h = await startHarness();
  meter = (await h.stripe.billing.meters.list()).data[0];
});
afterEach(async () => {
  await h.control('/_fake/faults', undefined, 'DELETE');
});
afterAll(async () => {
  await h.close();
});

const METER_EVENTS = '/v1/billing/meter_events';

async function sendOnce(customer: string, identifier: string): Promise<'ok' | unknown> {
  try {
    await h.stripe.billing.meterEvents.create(
      { event_name: METER_EVENT_NAME, payload: { stripe_customer_id: customer, value: '1' }, identifier },
      { idempotencyKey: identifier },
    );
    return 'ok';
  } catch (error) {
    return error;
  }
}

describe('test tool (local payment fake): fault injection', () => {
  it('50 % 500s on meter events reach the SDK as typed StripeAPIError; other paths are untouched', async () => {
    const customer = await h.stripe.customers.create({ email: 'faults@example.test' });
    const set = await h.control<{ failRate: number }>('/_fake/faults', {
      failRate: 0.5,
      status: 500,
      onlyPaths: [METER_EVENTS],
      seed: 7,
    });
    expect(set.body.failRate).toBe(0.5);

    const outcomes = [];
    for (let i = 0; i < 60; i++) outcomes.push(await sendOnce(customer.id, `f50_${customer.id}_${i}`));
    const failures = outcomes.filter((o) => o !== 'ok');
    expect(failures.length).toBeGreaterThan(15);
    expect(failures.length).toBeLessThan(45);
    for (const failure of failures) {
      expect(failure).toBeInstanceOf(Stripe.errors.StripeAPIError);
      expect(failure).toMatchObject({ statusCode: 500, rawType: 'api_error' });
    }
    for (let i = 0; i < 5; i++)
      await expect(h.stripe.customers.retrieve(customer.id)).resolves.toMatchObject({ id: customer.id });

    const { body } = await h.control<FakeState>('/_fake/state');
    expect(body.faults.injected).toBe(failures.length);
    expect(body.meterEvents.filter((e) => e.customer === customer.id)).toHaveLength(60 - failures.length);
  });

  it('a sender that retries with the same identifier and key loses and doubles nothing', async () => {
    const customer = await h.stripe.customers.create({ email: 'retry@example.test' });
    await h.control('/_fake/faults', { failRate: 0.5, onlyPaths: [METER_EVENTS], seed: 99 });
    const ledger = Array.from({ length: 40 }, (_, i) => `ledger_row_${customer.id}_${i}`);
    let retries = 0;
    for (const row of ledger) {
      for (let attempt = 0; ; attempt++) {
        const outcome = await sendOnce(customer.id, row);
        if (outcome === 'ok') break;
        expect(outcome).toBeInstanceOf(Stripe.errors.StripeAPIError);
        retries += 1;
        await new Promise((resolve) => setTimeout(resolve, 2 ** Math.min(attempt, 4)));
      }
    }
    expect(retries).toBeGreaterThan(0);
    const end = (Math.floor(Date.now() / 60_000) + 1) * 60;
    const summaries = await h.stripe.billing.meters.listEventSummaries(meter.id, {
      customer: customer.id,
      start_time: end - 3600,
      end_time: end,
    });
    expect(summaries.data[0].aggregated_value).toBe(ledger.length);
  });

  it('429s become StripeRateLimitError', async () => {
    await h.control('/_fake/faults', { failNext: 2, status: 429 });
    for (let i = 0; i < 2; i++) {
      const error = await h.stripe.customers.list().catch((e: unknown) => e);
      expect(error).toBeInstanceOf(Stripe.errors.StripeRateLimitError);
      expect(error).toMatchObject({ statusCode: 429, code: 'rate_limit' });
    }
    await expect(h.stripe.customers.list()).resolves.toMatchObject({ object: 'list' });
  });

  it('delayMs slows matching requests down and leaves the others alone', async () => {
    await h.control('/_fake/faults', { delayMs: 1_000, onlyPaths: ['/v1/customers'] });
    // A lower bound on the slow call, and an order rather than a duration for the other one: both
    // hold however busy the machine is (the unmatched call would have to take over a second to lose).
    const finished: string[] = [];
    const started = Date.now();
    const slow = h.stripe.customers.list().then(() => {
      finished.push('customers');
      return Date.now() - started;
    });
    await h.stripe.prices.list().then(() => finished.push('prices'));
    expect(await slow).toBeGreaterThanOrEqual(990);
    expect(finished).toEqual(['prices', 'customers']);
  });

  it('a slow reply past the SDK timeout is a StripeConnectionError', async () => {
    await h.control('/_fake/faults', { delayMs: 400 });
    const impatient = new Stripe('sk_test_tropopass_payment_fake_tests', {
      host: '127.0.0.1',
      port: h.fake.port,
      protocol: 'http',
      maxNetworkRetries: 0,
      timeout: 100,
    });
    await expect(impatient.customers.list()).rejects.toBeInstanceOf(Stripe.errors.StripeConnectionError);
  });

  it('bad fault settings are refused, and DELETE clears them', async () => {
    const bad = await h.control<{ error: { message: string } }>('/_fake/faults', { failRate: 2 });
    expect(bad.status).toBe(400);
    const typo = await h.control('/_fake/faults', { failrate: 0.5 });
    expect(typo.status).toBe(400);
    await h.control('/_fake/faults', { failRate: 1 });
    await expect(h.stripe.customers.list()).rejects.toBeInstanceOf(Stripe.errors.StripeAPIError);
    const cleared = await h.control<{ failRate: number }>('/_fake/faults', undefined, 'DELETE');
    expect(cleared.body.failRate).toBe(0);
    await expect(h.stripe.customers.list()).resolves.toMatchObject({ object: 'list' });
  });
});
