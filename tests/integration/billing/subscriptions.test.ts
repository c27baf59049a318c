import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, TEST_ORIGIN } from '../../support/test-db';
import { db } from '@/db/client';
import { getBilling } from '@/db/billing';
import { PLANS, TRIAL_DAYS } from '@/lib/billing/plans';
import { provisionBilling } from '@/lib/billing/provision';
import * as billingRoute from '@/app/api/v1/workspaces/[slug]/billing/route';
import * as subscriptionRoute from '@/app/api/v1/workspaces/[slug]/billing/subscription/route';
import { screen, until, useBillingHarness } from './harness';

const h = useBillingHarness();

type State = {
  planId: string;
  status: string;
  subscribed: boolean;
  trialEndsAt: string | null;
  cancelAtPeriodEnd: boolean;
  billingEmail: string | null;
  currentPeriodEnd: string | null;
};

async function asMember(userId: number) {
  const cookie = await sessionCookie(userId);
  return {
    subscribe: (slug: string, body: unknown) =>
      call<State>(
        subscriptionRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${slug}/billing/subscription`, { cookie, body, origin: TEST_ORIGIN }),
        { slug },
      ),
    update: (slug: string, body: unknown) =>
      call<State>(
        subscriptionRoute.PATCH,
        apiRequest('PATCH', `/api/v1/workspaces/${slug}/billing/subscription`, { cookie, body, origin: TEST_ORIGIN }),
        { slug },
      ),
    email: (slug: string, body: unknown) =>
      call<State>(
        billingRoute.PATCH,
        apiRequest('PATCH', `/api/v1/workspaces/${slug}/billing`, { cookie, body, origin: TEST_ORIGIN }),
        { slug },
      ),
    get: (slug: string) =>
      call<State & { invoices: unknown[] | null }>(
        billingRoute.GET,
        apiRequest('GET', `/api/v1/workspaces/${slug}/billing`, { cookie }),
        { slug },
      ),
  };
}

async function auditActions(workspaceId: number): Promise<string[]> {
  return (await db()('audit_log').where({ workspace_id: workspaceId }).orderBy('id').select('action')).map(
    (r: { action: string }) => r.action,
  );
}

async function fakeSubscription(workspaceId: number) {
  const b = await getBilling({ workspaceId });
  if (!b?.subscriptionId) throw new Error('no subscription stored');
  return h.sdk.subscriptions.retrieve(b.subscriptionId);
}

describe('trial', () => {
  it('a new workspace starts a free trial of the small plan, ending TRIAL_DAYS after it was created', async () => {
    const ws = await makeWorkspace();
    const created = (await db()('workspaces').where({ id: ws.id }).first()).created_at as string;
    const b = await getBilling({ workspaceId: ws.id });
    expect(b).toMatchObject({ status: 'trialing', planId: 'crew', subscriptionId: null });
    expect(Date.parse(b!.trialEndsAt!) - Date.parse(created)).toBe(TRIAL_DAYS * 86_400_000);
    const r = await screen(ws.slug, ws.owner.id);
    expect(r.status).toBe(201);
  });
});

describe('subscribe', () => {
  it('after the trial ended: screening refused (402) -> subscribe -> active at the payment service -> screening accepted', async () => {
    const ws = await makeWorkspace(['billing']);
    await db()('workspace_billing')
      .where({ workspace_id: ws.id })
      .update({ trial_ends_at: new Date(Date.now() - 86_400_000).toISOString() });
    const blocked = await screen(ws.slug, ws.owner.id);
    expect(blocked.status).toBe(402);
    expect(blocked.body.error?.message).toContain('trial');

    const finance = await asMember(ws.members.billing.id);
    const r = await finance.subscribe(ws.slug, { planId: 'crew', card: 'succeeds' });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ status: 'active', subscribed: true, planId: 'crew' });

    const sub = await fakeSubscription(ws.id);
    expect(sub.status).toBe('active');
    expect(sub.items.data.map((i) => i.price.lookup_key).sort()).toEqual(
      [PLANS.crew.baseLookupKey, PLANS.crew.meteredLookupKey].sort(),
    );
    const customer = await h.sdk.customers.retrieve(sub.customer as string);
    expect(customer).toMatchObject({ metadata: { workspace: ws.slug } });

    expect((await screen(ws.slug, ws.owner.id)).status).toBe(201);
    // The webhook for the new subscription arrives and finds nothing left to change.
    await until(
      async () => h.deliveries.some((d) => d.type === 'customer.subscription.created' && d.status === 200),
      'subscription.created webhook',
    );
    expect((await getBilling({ workspaceId: ws.id }))?.status).toBe('active');
    expect(await auditActions(ws.id)).toContain('billing.subscribed');
    // A second subscribe is refused, not a second subscription.
    const again = await finance.subscribe(ws.slug, { planId: 'fleet', card: 'succeeds' });
    expect(again.status).toBe(409);
    expect((await h.sdk.subscriptions.list({ customer: sub.customer as string })).data).toHaveLength(1);
  });

  it('during the trial: the rest of the trial stays free (trialing until the same end)', async () => {
    const ws = await makeWorkspace();
    const before = await getBilling({ workspaceId: ws.id });
    const owner = await asMember(ws.owner.id);
    const r = await owner.subscribe(ws.slug, { planId: 'fleet', card: 'succeeds' });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ status: 'trialing', subscribed: true, planId: 'fleet' });
    const sub = await fakeSubscription(ws.id);
    expect(sub.status).toBe('trialing');
    expect(sub.trial_end).toBe(Math.floor(Date.parse(before!.trialEndsAt!) / 1000));
  });

  it('422 names the bad field and changes nothing', async () => {
    const ws = await makeWorkspace();
    const owner = await asMember(ws.owner.id);
    const r = await owner.subscribe(ws.slug, { planId: 'galaxy', card: 'succeeds' });
    expect(r.status).toBe(422);
    expect(r.body.error?.fields?.map((f) => f.path)).toEqual(['planId']);
    const missing = await owner.subscribe(ws.slug, { planId: 'crew' });
    expect(missing.body.error?.fields?.map((f) => f.path)).toEqual(['card']);
    expect((await getBilling({ workspaceId: ws.id }))?.customerId).toBeNull();
  });
});

describe('change plan, cancel and resume', () => {
  it('moves both prices to the other plan at the payment service, records it and audits it', async () => {
    const ws = await makeWorkspace(['billing']);
    const finance = await asMember(ws.members.billing.id);
    await db()('workspace_billing')
      .where({ workspace_id: ws.id })
      .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString() });
    expect((await finance.subscribe(ws.slug, { planId: 'crew', card: 'succeeds' })).status).toBe(201);

    const r = await finance.update(ws.slug, { planId: 'fleet' });
    expect(r.status).toBe(200);
    expect(r.body.planId).toBe('fleet');
    const sub = await fakeSubscription(ws.id);
    expect(sub.items.data.map((i) => i.price.lookup_key).sort()).toEqual(
      [PLANS.fleet.baseLookupKey, PLANS.fleet.meteredLookupKey].sort(),
    );
    expect(await auditActions(ws.id)).toContain('billing.plan_changed');

    const cancel = await finance.update(ws.slug, { cancelAtPeriodEnd: true });
    expect(cancel.body).toMatchObject({ cancelAtPeriodEnd: true, status: 'active' });
    expect((await fakeSubscription(ws.id)).cancel_at_period_end).toBe(true);
    // Still active until the period ends: screening continues.
    expect((await screen(ws.slug, ws.owner.id)).status).toBe(201);
    const resume = await finance.update(ws.slug, { cancelAtPeriodEnd: false });
    expect(resume.body.cancelAtPeriodEnd).toBe(false);
    expect((await fakeSubscription(ws.id)).cancel_at_period_end).toBe(false);
    expect(await auditActions(ws.id)).toEqual(expect.arrayContaining(['billing.cancel_scheduled', 'billing.resumed']));

    const empty = await finance.update(ws.slug, {});
    expect(empty.status).toBe(422);
  });

  it('cancelling at period end then closing the period: canceled, and new screenings get 402', async () => {
    const ws = await makeWorkspace();
    const owner = await asMember(ws.owner.id);
    await db()('workspace_billing')
      .where({ workspace_id: ws.id })
      .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString() });
    await owner.subscribe(ws.slug, { planId: 'crew', card: 'succeeds' });
    await owner.update(ws.slug, { cancelAtPeriodEnd: true });
    const sub = await fakeSubscription(ws.id);
    expect((await h.control('/_fake/advance', { subscription: sub.id, wait: true })).status).toBe(200);
    expect((await getBilling({ workspaceId: ws.id }))?.status).toBe('canceled');
    const r = await screen(ws.slug, ws.owner.id);
    expect(r.status).toBe(402);
    expect(r.body.error?.message).toContain('no active subscription');
    expect(await auditActions(ws.id)).toContain('billing.subscription_ended');
  });
});

describe('billing e-mail', () => {
  it('is stored and set on the customer; a bad address is a 422 on billingEmail', async () => {
    const ws = await makeWorkspace(['billing']);
    const finance = await asMember(ws.members.billing.id);
    await finance.subscribe(ws.slug, { planId: 'crew', card: 'succeeds' });
    const r = await finance.email(ws.slug, { billingEmail: ' accounts@operator.example ' });
    expect(r.status).toBe(200);
    expect(r.body.billingEmail).toBe('accounts@operator.example');
    const b = await getBilling({ workspaceId: ws.id });
    expect((await h.sdk.customers.retrieve(b!.customerId!)) as { email: string | null }).toMatchObject({
      email: 'accounts@operator.example',
    });
    const bad = await finance.email(ws.slug, { billingEmail: 'not an address' });
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.[0]?.path).toBe('billingEmail');
    expect((await getBilling({ workspaceId: ws.id }))?.billingEmail).toBe('accounts@operator.example');
  });
});

describe('provisioning at start-up', () => {
  it('a row marked subscribed without payment-service objects gets a customer and an active subscription, once', async () => {
    const ws = await makeWorkspace();
    await db()('workspace_billing')
      .where({ workspace_id: ws.id })
      .update({ status: 'active', plan_id: 'fleet', trial_ends_at: null, billing_email: 'finance@operator.example' });
    await provisionBilling();
    await provisionBilling();
    const b = await getBilling({ workspaceId: ws.id });
    expect(b).toMatchObject({ status: 'active', planId: 'fleet', paymentMethodLabel: 'Test card that succeeds' });
    expect(b?.meteredSince).not.toBeNull();
    const customers = (await h.sdk.customers.list({ limit: 100 })).data.filter((c) => c.metadata.workspace === ws.slug);
    expect(customers).toHaveLength(1);
    expect(customers[0].email).toBe('finance@operator.example');
    const subs = await h.sdk.subscriptions.list({ customer: customers[0].id });
    expect(subs.data).toHaveLength(1);
    expect(subs.data[0].status).toBe('active');
    expect(subs.data[0].items.data.map((i) => i.price.lookup_key).sort()).toEqual(
      [PLANS.fleet.baseLookupKey, PLANS.fleet.meteredLookupKey].sort(),
    );
    // Started a month back, so one invoice (the month's base fee) is issued and paid at once: the
    // billing page has an invoice and its PDF to show from the first start.
    const invoices = await h.sdk.invoices.list({ customer: customers[0].id });
    expect(invoices.data).toHaveLength(1);
    expect(invoices.data[0]).toMatchObject({ status: 'paid', amount_due: PLANS.fleet.baseFeeCents });
    expect(invoices.data[0].invoice_pdf).toBeTruthy();
    // The current period starts now, and usage from before provisioning is not metered.
    expect(Date.parse(b!.meteredSince!)).toBeGreaterThan(Date.now() - 60_000);
    expect(Date.parse(b!.currentPeriodStart!)).toBeGreaterThan(Date.now() - 60_000);
  });

  it('a trial workspace gets a customer but no subscription', async () => {
    const ws = await makeWorkspace();
    await provisionBilling();
    const b = await getBilling({ workspaceId: ws.id });
    expect(b?.customerId).toMatch(/^cus_/);
    expect(b?.subscriptionId).toBeNull();
    expect(b?.status).toBe('trialing');
  });
});
