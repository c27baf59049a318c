import { describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { apiRequest, call, makeWorkspace, sessionCookie, TEST_ORIGIN } from '../../support/test-db';
import { db } from '@/db/client';
import { getBilling } from '@/db/billing';
import { estimateChargeCents } from '@/lib/billing/plans';
import { sendPendingUsage } from '@/lib/billing/usage-sender';
import * as webhookRoute from '@/app/api/webhooks/stripe/route';
import * as subscriptionRoute from '@/app/api/v1/workspaces/[slug]/billing/subscription/route';
import * as paymentMethodRoute from '@/app/api/v1/workspaces/[slug]/billing/payment-method/route';
import * as payRoute from '@/app/api/v1/workspaces/[slug]/billing/invoices/pay/route';
import { screen, signedWebhook, until, useBillingHarness } from './harness';

const h = useBillingHarness();

async function subscribedWith(card: 'succeeds' | 'declined') {
  const ws = await makeWorkspace(['billing', 'planner']);
  await db()('workspace_billing')
    .where({ workspace_id: ws.id })
    .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString(), billing_email: 'accounts@operator.example' });
  const cookie = await sessionCookie(ws.members.billing.id);
  const r = await call(
    subscriptionRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/subscription`, {
      cookie,
      body: { planId: 'crew', card },
      origin: TEST_ORIGIN,
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(201);
  await h.fake.webhooksIdle();
  return { ws, cookie, billing: (await getBilling({ workspaceId: ws.id }))! };
}

async function counts(workspaceId: number) {
  const [events, audit] = await Promise.all([
    db()('webhook_events').count({ n: '*' }).first(),
    db()('audit_log')
      .where({ workspace_id: workspaceId })
      .where('action', 'like', 'billing.%')
      .count({ n: '*' })
      .first(),
  ]);
  return { events: Number(events?.n), audit: Number(audit?.n) };
}

/** An event about this subscription as the payment service would send it. */
function eventFor(type: string, object: unknown, id = `evt_test_${Math.random().toString(36).slice(2, 12)}`) {
  return JSON.stringify({
    id,
    object: 'event',
    api_version: Stripe.API_VERSION,
    created: Math.floor(Date.now() / 1000),
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type,
    data: { object },
  });
}

describe('signature', () => {
  it('a bad, missing or wrongly keyed signature is a 400 and changes nothing', async () => {
    const { ws, billing } = await subscribedWith('succeeds');
    const sub = await h.sdk.subscriptions.retrieve(billing.subscriptionId!);
    const payload = eventFor('customer.subscription.updated', { ...sub, status: 'past_due' });
    const before = await counts(ws.id);

    const forged = await call(webhookRoute.POST, signedWebhook(payload, 'whsec_someone_else'));
    expect(forged.status).toBe(400);
    const tampered = signedWebhook(payload);
    const tamperedBody = payload.replace('"past_due"', '"canceled"');
    const tamperedReq = apiRequest('POST', '/api/webhooks/stripe', {
      rawBody: tamperedBody,
      headers: { 'stripe-signature': tampered.headers.get('stripe-signature')! },
    });
    expect((await call(webhookRoute.POST, tamperedReq)).status).toBe(400);
    const unsigned = await call(webhookRoute.POST, apiRequest('POST', '/api/webhooks/stripe', { rawBody: payload }));
    expect(unsigned.status).toBe(400);
    const garbage = await call(
      webhookRoute.POST,
      apiRequest('POST', '/api/webhooks/stripe', { rawBody: payload, headers: { 'stripe-signature': 't=1,v1=00' } }),
    );
    expect(garbage.status).toBe(400);

    expect(await counts(ws.id)).toEqual(before);
    expect((await getBilling({ workspaceId: ws.id }))?.status).toBe('active');
  });
});

describe('order', () => {
  it('an event about an earlier period of the same subscription, delivered late, does not move the period back', async () => {
    const { ws, billing } = await subscribedWith('succeeds');
    const sub = await h.sdk.subscriptions.retrieve(billing.subscriptionId!);
    const month = 30 * 86_400;
    const earlier = {
      ...sub,
      items: {
        ...sub.items,
        data: sub.items.data.map((i) => ({
          ...i,
          current_period_start: i.current_period_start - month,
          current_period_end: i.current_period_start,
        })),
      },
    };
    const r = await call<{ result: string }>(
      webhookRoute.POST,
      signedWebhook(eventFor('customer.subscription.updated', earlier)),
    );
    expect(r.status).toBe(200);
    const after = (await getBilling({ workspaceId: ws.id }))!;
    expect(after.currentPeriodStart).toBe(billing.currentPeriodStart);
    expect(after.currentPeriodEnd).toBe(billing.currentPeriodEnd);
    // A later period still moves it forward.
    const later = {
      ...sub,
      items: {
        ...sub.items,
        data: sub.items.data.map((i) => ({
          ...i,
          current_period_start: i.current_period_end,
          current_period_end: i.current_period_end + month,
        })),
      },
    };
    await call(webhookRoute.POST, signedWebhook(eventFor('customer.subscription.updated', later)));
    expect(Date.parse((await getBilling({ workspaceId: ws.id }))!.currentPeriodStart!)).toBeGreaterThan(
      Date.parse(billing.currentPeriodStart!),
    );
  });
});

describe('replays', () => {
  it('the same event delivered 5 times changes the state once: one webhook_events row, one audit row', async () => {
    const { ws, billing } = await subscribedWith('succeeds');
    const sub = await h.sdk.subscriptions.retrieve(billing.subscriptionId!);
    const payload = eventFor(
      'customer.subscription.updated',
      { ...sub, status: 'past_due' },
      'evt_test_replayed_five_times',
    );
    const before = await counts(ws.id);
    const results = [];
    for (let i = 0; i < 5; i++) results.push(await call<{ result: string }>(webhookRoute.POST, signedWebhook(payload)));
    expect(results.map((r) => r.status)).toEqual([200, 200, 200, 200, 200]);
    expect(results.map((r) => r.body.result)).toEqual([
      'processed',
      'duplicate',
      'duplicate',
      'duplicate',
      'duplicate',
    ]);
    expect(await counts(ws.id)).toEqual({ events: before.events + 1, audit: before.audit + 1 });
    expect((await getBilling({ workspaceId: ws.id }))?.status).toBe('past_due');
    expect(
      await db()('webhook_events').where({ id: 'evt_test_replayed_five_times' }).count({ n: '*' }).first(),
    ).toMatchObject({ n: 1 });
  });

  it('a real event resent by the payment service is recognised as the same event', async () => {
    const { ws } = await subscribedWith('succeeds');
    const created = h.fake
      .state()
      .events.filter((e) => e.type === 'customer.subscription.created')
      .at(-1)!;
    const before = await counts(ws.id);
    const resent = await h.fake.resendWebhook(created.id);
    expect(resent).toMatchObject({ delivered: true, status: 200 });
    expect(await counts(ws.id)).toEqual(before);
  });

  it('an event for a customer we do not know is acknowledged and ignored', async () => {
    const r = await call<{ result: string }>(
      webhookRoute.POST,
      signedWebhook(
        eventFor('invoice.paid', {
          id: 'in_nobody',
          object: 'invoice',
          customer: 'cus_nobody',
          amount_paid: 100,
          amount_due: 100,
          number: null,
          parent: null,
        }),
      ),
    );
    expect(r.status).toBe(200);
    expect(r.body.result).toBe('ignored');
  });
});

describe('a declined card', () => {
  it('past due (via advance + webhook) -> screening refused with 402 -> card fixed and invoice paid -> active -> screening accepted', async () => {
    const { ws, cookie, billing } = await subscribedWith('declined');
    for (let i = 0; i < 3; i++) expect((await screen(ws.slug, ws.members.planner.id)).status).toBe(201);
    await sendPendingUsage({ workspaceId: ws.id });

    const { body } = await h.control<{ invoice: Stripe.Invoice; subscription: Stripe.Subscription }>('/_fake/advance', {
      subscription: billing.subscriptionId,
      wait: true,
    });
    expect(body.invoice.status).toBe('open');
    expect(body.invoice.amount_due).toBe(estimateChargeCents('crew', 3));
    expect(body.subscription.status).toBe('past_due');
    expect(await getBilling({ workspaceId: ws.id })).toMatchObject({ status: 'past_due' });
    expect(h.deliveries.filter((d) => d.type === 'invoice.payment_failed').every((d) => d.status === 200)).toBe(true);

    const refused = await screen(ws.slug, ws.members.planner.id);
    expect(refused.status).toBe(402);
    expect(refused.body.error?.message).toContain('payment');

    // The billing contacts hear about it: the billing e-mail, the finance admin and the owner.
    for (const to of ['accounts@operator.example', ws.members.billing.email, ws.owner.email]) {
      const mail = await until(
        async () => h.mailsTo(to).find((m) => m.subject.startsWith('Payment failed')),
        `payment-failed mail to ${to}`,
      );
      expect(mail.text).toContain('Pay the open invoice');
      expect(mail.text).toContain(`/w/${ws.slug}/settings/billing`);
    }
    expect(h.mailsTo(ws.members.planner.email)).toEqual([]);

    const stillDeclined = await call(
      payRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/invoices/pay`, { cookie, origin: TEST_ORIGIN }),
      { slug: ws.slug },
    );
    expect(stillDeclined.status).toBe(402);

    const card = await call(
      paymentMethodRoute.PUT,
      apiRequest('PUT', `/api/v1/workspaces/${ws.slug}/billing/payment-method`, {
        cookie,
        body: { card: 'succeeds' },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    expect(card.status).toBe(200);
    const paid = await call<{ paid: number; billing: { status: string } }>(
      payRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/invoices/pay`, { cookie, origin: TEST_ORIGIN }),
      { slug: ws.slug },
    );
    expect(paid.status).toBe(200);
    expect(paid.body).toMatchObject({ paid: 1, billing: { status: 'active' } });
    await h.fake.webhooksIdle();
    expect((await getBilling({ workspaceId: ws.id }))?.status).toBe('active');
    const invoice = await h.sdk.invoices.retrieve(body.invoice.id);
    expect(invoice.status).toBe('paid');

    expect((await screen(ws.slug, ws.members.planner.id)).status).toBe(201);
    const actions = (await db()('audit_log').where({ workspace_id: ws.id }).orderBy('id').select('action')).map(
      (r: { action: string }) => r.action,
    );
    expect(actions).toEqual(
      expect.arrayContaining(['billing.payment_failed', 'billing.payment_method_changed', 'billing.invoice_paid']),
    );
  });

  it('the subscription ending at the payment service cancels the workspace: 402 on new screenings', async () => {
    const { ws, billing } = await subscribedWith('succeeds');
    await h.sdk.subscriptions.cancel(billing.subscriptionId!);
    await h.fake.webhooksIdle();
    expect((await getBilling({ workspaceId: ws.id }))?.status).toBe('canceled');
    expect((await screen(ws.slug, ws.members.planner.id)).status).toBe(402);
  });
});
