import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, TEST_ORIGIN, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as budgetRoute from '@/app/api/v1/workspaces/[slug]/billing/budget/route';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { db } from '@/db/client';
import { PLANS } from '@/lib/billing/plans';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from '../imports/support';

const mailEnv: Record<string, string> = {};
let fake: SmtpFake;
beforeAll(async () => {
  fake = await startSmtpFake({ smtpPort: 0, httpPort: 0 });
  mailEnv.SMTP_PORT = String(fake.smtpPort);
});
afterAll(async () => {
  await fake?.close();
});
useTestDatabase(mailEnv);

const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 40_000,
  emission: { eiNoxGPerKg: 14 },
  month: 6,
};
const PER_FLIGHT = PLANS.fleet.perFlightCents;

/** An active subscription on the fleet plan whose period runs around now. */
async function activeWorkspace() {
  const ws = await makeWorkspace(['analyst', 'planner', 'billing']);
  await addScheduleLibrary(ws.id);
  const now = Date.now();
  await db()('workspace_billing')
    .where({ workspace_id: ws.id })
    .update({
      plan_id: 'fleet',
      status: 'active',
      subscription_id: `sub_${ws.id}`,
      current_period_start: new Date(now - 10 * 86_400_000).toISOString(),
      current_period_end: new Date(now + 20 * 86_400_000).toISOString(),
    });
  return {
    ws,
    analyst: await sessionCookie(ws.members.analyst.id),
    billing: await sessionCookie(ws.members.billing.id),
    planner: await sessionCookie(ws.members.planner.id),
  };
}

async function count(table: string, where: Record<string, unknown>): Promise<number> {
  return Number(((await db()(table).where(where).count({ n: '*' }).first()) as { n: number | string }).n);
}

function dryRunRequest(slug: string, content: string, cookie: string, flag = '1'): Request {
  const r = uploadRequest(slug, content, { cookie });
  return new Request(new URL(`/api/v1/workspaces/${slug}/imports?dryRun=${flag}`, TEST_ORIGIN), {
    method: 'POST',
    headers: r.headers,
    body: r.body,
    duplex: 'half',
  } as RequestInit);
}

type Estimate = {
  dryRun: boolean;
  rows: number;
  billableUnits: number;
  estimatedChargeCents: number;
  perFlightCents: number;
  freePeriod: boolean;
  budget: { wouldExceed: boolean; hardStop: boolean } | null;
};
type Err = { error: { code: string; message: string } };

describe('import estimate before committing', () => {
  it('dryRun=1 answers the billable units and the charge they add, and saves nothing', async () => {
    const { ws, analyst } = await activeWorkspace();
    const file = csv(HEADER, ...goodRows(10));
    const r = await call<Estimate>(importsRoute.POST, dryRunRequest(ws.slug, file, analyst), { slug: ws.slug });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({
      dryRun: true,
      rows: 10,
      billableUnits: 10,
      perFlightCents: PER_FLIGHT,
      estimatedChargeCents: 10 * PER_FLIGHT,
      freePeriod: false,
      budget: null,
    });
    expect(await count('imports', { workspace_id: ws.id })).toBe(0);
    expect(await count('flights', { workspace_id: ws.id })).toBe(0);
    // The confirmed upload of the same file is then accepted.
    const real = await call(importsRoute.POST, uploadRequest(ws.slug, file, { cookie: analyst }), { slug: ws.slug });
    expect(real.status).toBe(202);
  });

  it('a free trial estimates no charge; a bad dryRun value is a 422 naming it', async () => {
    const ws = await makeWorkspace(['analyst']);
    await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const r = await call<Estimate>(importsRoute.POST, dryRunRequest(ws.slug, csv(HEADER, ...goodRows(3)), cookie), {
      slug: ws.slug,
    });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ billableUnits: 3, estimatedChargeCents: 0, freePeriod: true });
    const bad = await call<Err & { error: { fields: { path: string }[] } }>(
      importsRoute.POST,
      dryRunRequest(ws.slug, csv(HEADER, ...goodRows(3)), cookie, 'maybe'),
      { slug: ws.slug },
    );
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields[0].path).toBe('dryRun');
  });
});

describe('monthly usage budget', () => {
  it('e-mails the billing contacts once at 80 % and once at 100 %, then the hard stop refuses with 402', async () => {
    const { ws, billing, planner, analyst } = await activeWorkspace();
    const set = await call<{ budgetCents: number; hardStop: boolean }>(
      budgetRoute.PUT,
      apiRequest('PUT', `/api/v1/workspaces/${ws.slug}/billing/budget`, {
        cookie: billing,
        body: { budgetCents: 5 * PER_FLIGHT, hardStop: true },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    expect(set.status).toBe(200);
    expect(set.body).toMatchObject({ budgetCents: 5 * PER_FLIGHT, hardStop: true });
    const byPlanner = await call(
      budgetRoute.PUT,
      apiRequest('PUT', `/api/v1/workspaces/${ws.slug}/billing/budget`, {
        cookie: planner,
        body: { budgetCents: 1, hardStop: false },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    expect(byPlanner.status).toBe(403);

    const mails = () =>
      fake.messages().filter((m) => m.to.includes(ws.members.billing.email) && /monthly usage budget/.test(m.subject));
    const screen = () =>
      call<Err>(
        screeningsRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie: planner, body: FLIGHT }),
        { slug: ws.slug },
      );
    for (let i = 0; i < 3; i++) expect((await screen()).status).toBe(201);
    expect(mails()).toHaveLength(0);
    // The 4th unit is 80 % of a 5-unit budget.
    expect((await screen()).status).toBe(201);
    await waitFor(() => mails().length === 1);
    expect(mails()[0].subject).toContain('80 %');
    // The 5th reaches 100 %: one more mail, and the 80 % one is not repeated.
    expect((await screen()).status).toBe(201);
    await waitFor(() => mails().length === 2);
    expect(mails()[1].subject).toContain('100 %');
    const refused = await screen();
    expect(refused.status).toBe(402);
    expect(refused.body.error.message).toMatch(/monthly usage budget/);
    expect(refused.body.error.message).toContain('Settings → Billing');
    expect(await count('screenings', { workspace_id: ws.id })).toBe(5);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(5);

    // An import that would pass the budget is refused whole, and its estimate says so first.
    await call(
      budgetRoute.PUT,
      apiRequest('PUT', `/api/v1/workspaces/${ws.slug}/billing/budget`, {
        cookie: billing,
        body: { budgetCents: 8 * PER_FLIGHT, hardStop: true },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    const file = csv(HEADER, ...goodRows(4));
    const est = await call<Estimate>(importsRoute.POST, dryRunRequest(ws.slug, file, analyst), { slug: ws.slug });
    expect(est.body.budget).toMatchObject({ wouldExceed: true, hardStop: true });
    const imp = await call<Err>(importsRoute.POST, uploadRequest(ws.slug, file, { cookie: analyst }), {
      slug: ws.slug,
    });
    expect(imp.status).toBe(402);
    expect(imp.body.error.message).toContain('these 4 flights');
    expect(await count('imports', { workspace_id: ws.id })).toBe(0);

    // Without the hard stop the work goes on past the budget; no third mail in the same period.
    await call(
      budgetRoute.PUT,
      apiRequest('PUT', `/api/v1/workspaces/${ws.slug}/billing/budget`, {
        cookie: billing,
        body: { budgetCents: 5 * PER_FLIGHT, hardStop: false },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    expect((await screen()).status).toBe(201);
    const up = await call(importsRoute.POST, uploadRequest(ws.slug, file, { cookie: analyst }), { slug: ws.slug });
    expect(up.status).toBe(202);
    await runImportsToCompletion();
    expect(mails()).toHaveLength(2);
  });

  it('imported flights count towards the budget as the worker screens them', async () => {
    const { ws, billing, analyst } = await activeWorkspace();
    await call(
      budgetRoute.PUT,
      apiRequest('PUT', `/api/v1/workspaces/${ws.slug}/billing/budget`, {
        cookie: billing,
        body: { budgetCents: 10 * PER_FLIGHT, hardStop: false },
        origin: TEST_ORIGIN,
      }),
      { slug: ws.slug },
    );
    expect(
      (
        await call(importsRoute.POST, uploadRequest(ws.slug, csv(HEADER, ...goodRows(12)), { cookie: analyst }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(202);
    await runImportsToCompletion({ chunkSize: 4 });
    const subjects = () =>
      fake
        .messages()
        .filter((m) => m.to.includes(ws.members.billing.email))
        .map((m) => m.subject);
    await waitFor(() => subjects().length >= 2);
    expect(subjects()).toHaveLength(2);
    expect(subjects()).toEqual(
      expect.arrayContaining([expect.stringContaining('80 %'), expect.stringContaining('100 %')]),
    );
    const state = await call<{ units: number; usageChargeCents: number }>(
      budgetRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/billing/budget`, { cookie: billing }),
      { slug: ws.slug },
    );
    expect(state.body).toMatchObject({ units: 12, usageChargeCents: 12 * PER_FLIGHT });
  });
});

async function waitFor(ok: () => boolean, ms = 3000): Promise<void> {
  const until = Date.now() + ms;
  while (!ok()) {
    if (Date.now() > until) throw new Error('timed out waiting for the mail');
    await new Promise((r) => setTimeout(r, 20));
  }
}
