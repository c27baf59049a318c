import { describe, expect, it } from 'vitest';
import type Stripe from 'stripe';
import { apiRequest, call, makeUser, makeWorkspace, sessionCookie, TEST_ORIGIN } from '../../support/test-db';
import { db } from '@/db/client';
import { getBilling } from '@/db/billing';
import { can } from '@/lib/auth/policy';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as screeningRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import * as flightsRoute from '@/app/api/v1/workspaces/[slug]/flights/route';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as fleetsRoute from '@/app/api/v1/workspaces/[slug]/fleets/route';
import * as compareRoute from '@/app/api/v1/workspaces/[slug]/fleets/compare/route';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import * as routesRoute from '@/app/api/v1/workspaces/[slug]/routes/route';
import * as enginesRoute from '@/app/api/v1/workspaces/[slug]/engines/route';
import * as aircraftRoute from '@/app/api/v1/workspaces/[slug]/aircraft-types/route';
import * as usageRoute from '@/app/api/v1/workspaces/[slug]/usage/route';
import * as billingRoute from '@/app/api/v1/workspaces/[slug]/billing/route';
import * as subscriptionRoute from '@/app/api/v1/workspaces/[slug]/billing/subscription/route';
import * as invoicePdfRoute from '@/app/api/v1/workspaces/[slug]/invoices/[id]/pdf/route';
import { FLIGHT, screen, useBillingHarness } from './harness';

const h = useBillingHarness();

describe('a finance admin sees billing and usage, never flight data', () => {
  it('403 on every flight-data API; 200 on usage and billing', async () => {
    const ws = await makeWorkspace(['billing']);
    const saved = await screen(ws.slug, ws.owner.id);
    expect(saved.status).toBe(201);
    const cookie = await sessionCookie(ws.members.billing.id);
    const flightData: [string, string, unknown, Record<string, string>, unknown?][] = [
      ['GET', 'screenings', screeningsRoute.GET, {}],
      ['POST', 'screenings', screeningsRoute.POST, {}, FLIGHT],
      ['GET', `screenings/${saved.body.id}`, screeningRoute.GET, { id: String(saved.body.id) }],
      ['POST', 'screenings/preview', previewRoute.POST, {}, FLIGHT],
      ['GET', 'flights', flightsRoute.GET, {}],
      ['GET', 'imports', importsRoute.GET, {}],
      ['GET', 'fleets', fleetsRoute.GET, {}],
      ['GET', 'fleets/compare', compareRoute.GET, {}],
      ['GET', 'reports', reportsRoute.GET, {}],
      ['GET', 'routes', routesRoute.GET, {}],
      ['GET', 'engines', enginesRoute.GET, {}],
      ['GET', 'aircraft-types', aircraftRoute.GET, {}],
    ];
    const statuses = [];
    for (const [method, p, handler, params, body] of flightData) {
      const r = await call(
        handler,
        apiRequest(method, `/api/v1/workspaces/${ws.slug}/${p}`, { cookie, body, origin: TEST_ORIGIN }),
        { slug: ws.slug, ...params },
      );
      statuses.push(`${method} ${p} ${r.status}`);
      expect(JSON.stringify(r.body)).not.toContain('EGLL');
    }
    expect(statuses).toEqual(flightData.map(([m, p]) => `${m} ${p} 403`));
    expect(can('billing', 'flights:read')).toBe(false);

    const usage = await call<{ units: number }>(
      usageRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/usage`, { cookie }),
      { slug: ws.slug },
    );
    expect(usage.status).toBe(200);
    expect(usage.body.units).toBe(1);
    const billing = await call(
      billingRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/billing`, { cookie }),
      { slug: ws.slug },
    );
    expect(billing.status).toBe(200);
  });

  it('planners, analysts and viewers get 403 on usage and billing; strangers 404', async () => {
    const ws = await makeWorkspace(['planner', 'analyst', 'viewer']);
    for (const role of ['planner', 'analyst', 'viewer']) {
      const cookie = await sessionCookie(ws.members[role].id);
      const u = await call(usageRoute.GET, apiRequest('GET', `/api/v1/workspaces/${ws.slug}/usage`, { cookie }), {
        slug: ws.slug,
      });
      const b = await call(
        subscriptionRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/subscription`, {
          cookie,
          body: { planId: 'crew', card: 'succeeds' },
          origin: TEST_ORIGIN,
        }),
        { slug: ws.slug },
      );
      expect([role, u.status, b.status]).toEqual([role, 403, 403]);
    }
    const stranger = await makeUser('stranger');
    const s = await call(
      usageRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/usage`, { cookie: await sessionCookie(stranger.id) }),
      { slug: ws.slug },
    );
    expect(s.status).toBe(404);
    expect((await getBilling({ workspaceId: ws.id }))?.subscriptionId).toBeNull();
  });
});

describe('invoice download', () => {
  it('streams the PDF to the finance admin; another workspace cannot fetch it through its own address', async () => {
    const ws = await makeWorkspace(['billing', 'planner']);
    await db()('workspace_billing')
      .where({ workspace_id: ws.id })
      .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString() });
    const cookie = await sessionCookie(ws.members.billing.id);
    await call(
      subscriptionRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/subscription`, {
        cookie,
        body: { planId: 'fleet', card: 'succeeds' },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    const b = await getBilling({ workspaceId: ws.id });
    const { body } = await h.control<{ invoice: Stripe.Invoice }>('/_fake/advance', {
      subscription: b!.subscriptionId,
      wait: true,
    });
    const id = body.invoice.id;

    const list = await call<{ invoices: { id: string; amountDueCents: number; status: string; hasPdf: boolean }[] }>(
      billingRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/billing`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.invoices).toEqual([
      expect.objectContaining({ id, amountDueCents: body.invoice.amount_due, status: 'paid', hasPdf: true }),
    ]);

    const res = await invoicePdfRoute.GET(
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/invoices/${id}/pdf`, { cookie }),
      { params: Promise.resolve({ slug: ws.slug, id }) },
    );
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="[A-Za-z0-9._-]+\.pdf"$/);
    const bytes = Buffer.from(await res.arrayBuffer());
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');

    const planner = await call(
      invoicePdfRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/invoices/${id}/pdf`, {
        cookie: await sessionCookie(ws.members.planner.id),
      }),
      { slug: ws.slug, id },
    );
    expect(planner.status).toBe(403);

    const other = await makeWorkspace();
    await call(
      subscriptionRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${other.slug}/billing/subscription`, {
        cookie: await sessionCookie(other.owner.id),
        body: { planId: 'crew', card: 'succeeds' },
        origin: TEST_ORIGIN,
      }),
      { slug: other.slug },
    );
    const cross = await call(
      invoicePdfRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${other.slug}/invoices/${id}/pdf`, {
        cookie: await sessionCookie(other.owner.id),
      }),
      { slug: other.slug, id },
    );
    expect(cross.status).toBe(404);
    const junk = await call(
      invoicePdfRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/invoices/..%2F..%2Fetc/pdf`, { cookie }),
      { slug: ws.slug, id: '../../etc' },
    );
    expect(junk.status).toBe(404);
  });
});
