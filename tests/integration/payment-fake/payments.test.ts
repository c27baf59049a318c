import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { METER_EVENT_NAME, PLANS, estimateChargeCents, formatUsd } from '../../../lib/billing/plans';
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

async function declinedSubscriptionWithUsage(units: number) {
  const { customer } = await customerWithCard(h.stripe, 'pm_card_chargeDeclined', 'finance@example.test');
  const sub = await h.stripe.subscriptions.create({
    customer: customer.id,
    items: [
      { price: prices.get(PLANS.crew.baseLookupKey)!.id },
      { price: prices.get(PLANS.crew.meteredLookupKey)!.id },
    ],
  });
  await h.stripe.billing.meterEvents.create({
    event_name: METER_EVENT_NAME,
    payload: { stripe_customer_id: customer.id, value: String(units) },
  });
  const { body } = await h.control<{ subscription: Stripe.Subscription; invoice: Stripe.Invoice }>('/_fake/advance', {
    subscription: sub.id,
    wait: true,
  });
  return { customer, sub, ...body };
}

const subscriptionOf = (e: Stripe.Event) => e.data.object as Stripe.Subscription;
const invoiceOf = (e: Stripe.Event) => e.data.object as Stripe.Invoice;

describe('test tool (local payment fake): a declined card', () => {
  it('past_due + invoice.payment_failed, then the card is fixed and the invoice paid: active again', async () => {
    const { customer, sub, invoice, subscription } = await declinedSubscriptionWithUsage(6);
    const due = estimateChargeCents('crew', 6);
    expect(invoice).toMatchObject({
      status: 'open',
      amount_due: due,
      amount_paid: 0,
      amount_remaining: due,
      attempt_count: 1,
    });
    expect(subscription.status).toBe('past_due');

    const failed = await h.receiver.waitFor(
      (e) => e.type === 'invoice.payment_failed' && invoiceOf(e).id === invoice.id,
    );
    expect(invoiceOf(failed).amount_due).toBe(due);
    const pastDue = await h.receiver.waitFor(
      (e) =>
        e.type === 'customer.subscription.updated' &&
        subscriptionOf(e).id === sub.id &&
        subscriptionOf(e).status === 'past_due',
    );
    expect(pastDue.data.previous_attributes).toMatchObject({ status: 'active' });

    const declined = await h.stripe.invoices.pay(invoice.id).catch((e: unknown) => e);
    expect(declined).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(declined).toMatchObject({ statusCode: 402, code: 'card_declined', decline_code: 'generic_decline' });
    expect((await h.stripe.invoices.retrieve(invoice.id)).attempt_count).toBe(2);

    const card = await h.stripe.paymentMethods.attach('pm_card_visa', { customer: customer.id });
    await h.stripe.customers.update(customer.id, { invoice_settings: { default_payment_method: card.id } });
    const paid = await h.stripe.invoices.pay(invoice.id);
    expect(paid).toMatchObject({ status: 'paid', amount_paid: due, amount_remaining: 0 });
    expect(paid.status_transitions.paid_at).not.toBeNull();

    await h.receiver.waitFor((e) => e.type === 'invoice.paid' && invoiceOf(e).id === invoice.id);
    const active = await h.receiver.waitFor(
      (e) =>
        e.type === 'customer.subscription.updated' &&
        subscriptionOf(e).id === sub.id &&
        subscriptionOf(e).status === 'active',
    );
    expect(active.data.previous_attributes).toMatchObject({ status: 'past_due' });
    expect((await h.stripe.subscriptions.retrieve(sub.id)).status).toBe('active');

    const again = await h.stripe.invoices.pay(invoice.id).catch((e: unknown) => e);
    expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it('setting a working card on the past-due subscription retries its open invoice', async () => {
    const { sub, invoice } = await declinedSubscriptionWithUsage(2);
    const updated = await h.stripe.subscriptions.update(sub.id, { default_payment_method: 'pm_card_visa' });
    expect(updated.status).toBe('active');
    expect(updated.default_payment_method).toMatch(/^pm_/);
    expect((await h.stripe.invoices.retrieve(invoice.id)).status).toBe('paid');
  });

  it('no payment method at all: the period closes past_due, and paying says why', async () => {
    const customer = await h.stripe.customers.create({ email: 'nocard@example.test' });
    const sub = await h.stripe.subscriptions.create({
      customer: customer.id,
      items: [
        { price: prices.get(PLANS.fleet.baseLookupKey)!.id },
        { price: prices.get(PLANS.fleet.meteredLookupKey)!.id },
      ],
    });
    const { body } = await h.control<{ subscription: Stripe.Subscription; invoice: Stripe.Invoice }>('/_fake/advance', {
      subscription: sub.id,
    });
    expect(body.subscription.status).toBe('past_due');
    expect(body.invoice.amount_due).toBe(PLANS.fleet.baseFeeCents);
    await expect(h.stripe.invoices.pay(body.invoice.id)).rejects.toMatchObject({ statusCode: 400 });
    const paid = await h.stripe.invoices.pay(body.invoice.id, { payment_method: 'pm_card_visa' });
    expect(paid.status).toBe('paid');
  });
});

describe('test tool (local payment fake): hosted invoice and PDF', () => {
  it('the links on the invoice serve an HTML page and a PDF from the fake', async () => {
    const { customer } = await customerWithCard(h.stripe, 'pm_card_visa', 'pdf@example.test');
    const sub = await h.stripe.subscriptions.create({
      customer: customer.id,
      items: [
        { price: prices.get(PLANS.crew.baseLookupKey)!.id },
        { price: prices.get(PLANS.crew.meteredLookupKey)!.id },
      ],
    });
    await h.stripe.billing.meterEvents.create({
      event_name: METER_EVENT_NAME,
      payload: { stripe_customer_id: customer.id, value: '12' },
    });
    const { body } = await h.control<{ invoice: Stripe.Invoice }>('/_fake/advance', { subscription: sub.id });
    const invoice = await h.stripe.invoices.retrieve(body.invoice.id);
    expect(invoice.hosted_invoice_url).toBe(`${h.fake.url}/_fake/invoices/${invoice.id}`);
    const total = formatUsd(estimateChargeCents('crew', 12));

    const page = await fetch(invoice.hosted_invoice_url!);
    expect(page.status).toBe(200);
    expect(page.headers.get('content-type')).toContain('text/html');
    const html = await page.text();
    expect(html).toContain(invoice.number!);
    expect(html).toContain(total);

    const pdf = await fetch(invoice.invoice_pdf!);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
    const bytes = Buffer.from(await pdf.arrayBuffer());
    const text = bytes.toString('latin1');
    expect(text.startsWith('%PDF-1.4')).toBe(true);
    expect(text.trimEnd().endsWith('%%EOF')).toBe(true);
    expect(text).toContain(total);
    const xrefAt = Number(/startxref\n(\d+)/.exec(text)![1]);
    expect(text.slice(xrefAt, xrefAt + 4)).toBe('xref');

    const missing = await fetch(`${h.fake.url}/_fake/invoices/in_nope`);
    expect(missing.status).toBe(404);
  });
});
