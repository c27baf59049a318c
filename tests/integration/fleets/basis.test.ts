import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as compareRoute from '@/app/api/v1/workspaces/[slug]/fleets/compare/route';
import { db } from '@/db/client';
import { adjustFlightRollups } from '@/db/flight-rollups';
import type { FleetComparison } from '@/lib/fleets/types';
import { insertFleet, insertFlight, insertType } from './flight-fixtures';

useTestDatabase();

/**
 * Two planned flights (A, B) and a flown track of A only, with NOx above the tropopause of 10 and 20
 * kg planned and 13 kg flown for A: planned sums 30, flown 13, flown-where-available 13 + 20 = 33.
 */
async function setUp() {
  const ws = await makeWorkspace(['analyst']);
  const cookie = await sessionCookie(ws.members.analyst.id);
  const fleet = await insertFleet(ws.id, 'Polar');
  const type = await insertType(ws.id, 'T-1', fleet);
  const base = { date: '2026-11-05', typeId: type, code: 'T-1', distanceKm: 5000, fuelKg: 30_000 };
  const a = await insertFlight(ws.id, { ...base, flight: 'PA', noxKg: 400, noxAboveKg: 10 });
  await insertFlight(ws.id, { ...base, flight: 'PB', noxKg: 400, noxAboveKg: 20 });
  const planA = await db()('flights').where({ id: a }).first();
  const flownId = await insertFlight(ws.id, { ...base, flight: 'PX', noxKg: 420, noxAboveKg: 13 });
  // The flown row of flight A: same flight, date, origin and destination, basis flown.
  // Taken out of the roll-ups and put back under its new key, as every write of a screened flight does.
  await adjustFlightRollups(db(), (q) => q.where('id', flownId), -1);
  await db()('flights').where({ id: flownId }).update({ flight: planA.flight, basis: 'flown' });
  await adjustFlightRollups(db(), (q) => q.where('id', flownId), 1);
  return { ws, cookie, flownId };
}

async function compare(slug: string, cookie: string, basis?: string) {
  const qs = new URLSearchParams({ from: '2026-11-01', to: '2026-11-30', ...(basis ? { basis } : {}) });
  return call<FleetComparison>(
    compareRoute.GET,
    apiRequest('GET', `/api/v1/workspaces/${slug}/fleets/compare?${qs}`, { cookie }),
    { slug },
  );
}

describe('fleet comparison basis', () => {
  it.each([
    [undefined, 2, 30],
    ['planned', 2, 30],
    ['flown', 1, 13],
    ['flown-where-available', 2, 33],
  ])('basis %s sums %i flights and %i kg NOx above the tropopause', async (basis, flights, above) => {
    const { ws, cookie } = await setUp();
    const r = await compare(ws.slug, cookie, basis);
    expect(r.status).toBe(200);
    expect(r.body.totals.flights).toBe(flights);
    expect(r.body.totals.noxAboveKg).toBeCloseTo(above, 9);
    expect(r.body.filters.basis).toBe(basis ?? 'planned');
  });

  it('a flown track still pending does not replace its plan in flown-where-available', async () => {
    const { ws, cookie, flownId } = await setUp();
    await db()('flights').where({ id: flownId }).update({ status: 'pending' });
    const r = await compare(ws.slug, cookie, 'flown-where-available');
    expect(r.body.totals.flights).toBe(2);
    expect(r.body.totals.noxAboveKg).toBeCloseTo(30, 9);
  });

  it('an unknown basis is a 422 naming the field', async () => {
    const { ws, cookie } = await setUp();
    const r = await call<{ error: { fields: { path: string }[] } }>(
      compareRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/fleets/compare?basis=guessed`, { cookie }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    expect(r.body.error.fields.map((f) => f.path)).toContain('basis');
  });
});
