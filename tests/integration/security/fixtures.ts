import { TEST_ORIGIN, apiRequest, call, sessionCookie } from '../../support/test-db';
import { db, nowIso } from '@/db/client';
import { createApiKey } from '@/lib/auth/api-keys';
import { getBilling } from '@/db/billing';
import { env } from '@/lib/env';

/** A small valid flight (DESIGN.md's screenFlight input). */
export const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 50_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

export const SOUNDING_LEVELS = [
  { altitudeM: 8000, temperatureK: 236 },
  { altitudeM: 9000, temperatureK: 229 },
  { altitudeM: 10500, temperatureK: 219 },
  { altitudeM: 12000, temperatureK: 217 },
  { altitudeM: 14000, temperatureK: 217 },
];

export interface Ws {
  id: number;
  slug: string;
  owner: { id: number };
}

type Maker = (ws: Ws) => Promise<number | string>;

const unique = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 7)}`;

/** Creates a row through the route's own POST handler, as the workspace owner, and returns its id. */
async function viaPost(ws: Ws, handler: unknown, resource: string, body: unknown): Promise<number> {
  const r = await call<{ id: number }>(
    handler,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/${resource}`, { cookie: await sessionCookie(ws.owner.id), body }),
    { slug: ws.slug },
  );
  if (r.status !== 201 || typeof r.body.id !== 'number')
    throw new Error(`fixture ${resource}: ${r.status} ${JSON.stringify(r.body).slice(0, 300)}`);
  return r.body.id;
}

async function fleet(ws: Ws): Promise<number> {
  const [row] = await db()('fleets')
    .insert({ workspace_id: ws.id, name: `Fixture fleet ${unique()}`, description: '', created_at: nowIso() })
    .returning('id');
  return Number(typeof row === 'object' ? row.id : row);
}

const invoiceOf = new Map<number, Promise<string>>();

/** Subscribes the workspace (trial over) and has the payment fake close its first period: one paid invoice. */
async function makeInvoice(ws: Ws): Promise<string> {
  await db()('workspace_billing')
    .where({ workspace_id: ws.id })
    .update({ trial_ends_at: new Date(Date.now() - 1000).toISOString() });
  const { POST } = await import('@/app/api/v1/workspaces/[slug]/billing/subscription/route');
  const sub = await call(
    POST,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/billing/subscription`, {
      cookie: await sessionCookie(ws.owner.id),
      body: { planId: 'crew', card: 'succeeds' },
      origin: TEST_ORIGIN,
    }),
    { slug: ws.slug },
  );
  if (sub.status >= 300) throw new Error(`fixture invoices: subscribing answered ${sub.status}`);
  const billing = await getBilling({ workspaceId: ws.id });
  const res = await fetch(`http://127.0.0.1:${env().STRIPE_API_PORT}/_fake/advance`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ subscription: billing?.subscriptionId, wait: true }),
  });
  const body = (await res.json()) as { invoice?: { id?: string } };
  if (!res.ok || typeof body.invoice?.id !== 'string')
    throw new Error(`fixture invoices: the fake answered ${res.status}`);
  return body.invoice.id;
}

/**
 * Makes one row of the right workspace for a route's `[id]`, keyed by the path segment before it.
 * A route whose resource is not listed here is called with a missing id, and its 404 is then
 * ambiguous (the matrix reports those routes).
 */
export const ID_FIXTURES: Record<string, Maker> = {
  screenings: async (ws) =>
    viaPost(ws, (await import('@/app/api/v1/workspaces/[slug]/screenings/route')).POST, 'screenings', FLIGHT),
  'api-keys': async (ws) =>
    (
      await createApiKey(
        { workspaceId: ws.id },
        { name: `fixture-${unique()}`, role: 'viewer', createdBy: ws.owner.id, actor: 'fixture' },
      )
    ).id,
  fleets: fleet,
  engines: async (ws) =>
    viaPost(ws, (await import('@/app/api/v1/workspaces/[slug]/engines/route')).POST, 'engines', {
      name: `Fixture engine ${unique()}`,
      fuelFlowKgS: [0.1, 0.3, 0.9, 1.1],
      eiNoxGPerKg: [5, 11, 23, 30],
      source: 'fixture',
    }),
  'aircraft-types': async (ws) =>
    viaPost(ws, (await import('@/app/api/v1/workspaces/[slug]/aircraft-types/route')).POST, 'aircraft-types', {
      code: `FX-${unique()}`.slice(0, 16),
      name: 'Fixture',
      directEiGPerKg: 14,
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 370,
    }),
  routes: async (ws) =>
    viaPost(ws, (await import('@/app/api/v1/workspaces/[slug]/routes/route')).POST, 'routes', {
      name: `Fixture route ${unique()}`,
      waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }],
    }),
  soundings: async (ws) =>
    viaPost(ws, (await import('@/app/api/v1/workspaces/[slug]/soundings/route')).POST, 'soundings', {
      name: `Fixture sounding ${unique()}`,
      levels: SOUNDING_LEVELS,
    }),
  reports: async (ws) =>
    viaPost(ws, (await import('@/app/api/v1/workspaces/[slug]/reports/route')).POST, 'reports', {
      name: `Fixture report ${unique()}`,
      from: '2026-09-01',
      to: '2026-11-30',
      fleetIds: [await fleet(ws)],
    }),
  fixes: async (ws) => {
    const [row] = await db()('fixes')
      .insert({
        workspace_id: ws.id,
        name: `FX${unique()}`.slice(0, 12).toUpperCase(),
        region: '',
        lat: 60,
        lon: -20,
        created_at: nowIso(),
      })
      .returning('id');
    return Number(typeof row === 'object' ? row.id : row);
  },
  airways: async (ws) => {
    const [row] = await db()('airways')
      .insert({ workspace_id: ws.id, name: `QX${unique()}`.slice(0, 12).toUpperCase(), created_at: nowIso() })
      .returning('id');
    return Number(typeof row === 'object' ? row.id : row);
  },
  flights: async (ws) => {
    const [row] = await db()('flights')
      .insert({
        workspace_id: ws.id,
        date: '2026-11-03',
        flight: `FX${unique()}`.slice(0, 16).toUpperCase(),
        origin: 'EGLL',
        destination: 'KJFK',
        aircraft_code: 'FIXTURE',
        cruise_fl: 370,
        max_fl: 370,
        input_json: JSON.stringify(FLIGHT),
        status: 'pending',
        fuel_kg: FLIGHT.fuelBurnKg,
        created_at: nowIso(),
      })
      .returning('id');
    return Number(typeof row === 'object' ? row.id : row);
  },
  imports: async (ws) => {
    const [row] = await db()('imports')
      .insert({
        workspace_id: ws.id,
        kind: 'schedule',
        file_name: 'fixture.csv',
        file_hash: unique().padEnd(64, '0').slice(0, 64),
        status: 'complete',
        rows: 0,
        rows_done: 0,
        created_by: ws.owner.id,
        created_at: nowIso(),
        finished_at: nowIso(),
      })
      .returning('id');
    return Number(typeof row === 'object' ? row.id : row);
  },
  // A fresh custom period (open) each call: the matrix may move it to review or sign it.
  periods: async (ws) => {
    const now = nowIso();
    const [row] = await db()('reporting_periods')
      .insert({
        workspace_id: ws.id,
        kind: 'custom',
        key: `fx-${unique()}`,
        name: 'Fixture period',
        date_from: '2026-09-01',
        date_to: '2026-11-30',
        state: 'open',
        created_at: now,
        updated_at: now,
      })
      .returning('id');
    const id = Number(typeof row === 'object' ? row.id : row);
    await db()('reporting_periods')
      .where({ id })
      .update({ key: `c${id}` });
    return `c${id}`;
  },
};

/**
 * Fixtures that need the local payment fake: only for files that run under useBillingHarness (the
 * authorisation matrix). One invoice per workspace is enough (the PDF route only reads it).
 */
export const BILLING_ID_FIXTURES: Record<string, Maker> = {
  invoices: async (ws) => {
    const made = invoiceOf.get(ws.id) ?? makeInvoice(ws);
    invoiceOf.set(ws.id, made);
    return made;
  },
};

/** The resource name an `[id]` belongs to: `/api/v1/workspaces/[slug]/fleets/[id]/...` -> `fleets`. */
export function resourceOf(pattern: string, param: string): string | undefined {
  const parts = pattern.split('/');
  const i = parts.findIndex((p) => p === `[${param}]`);
  return i > 0 ? parts[i - 1] : undefined;
}
