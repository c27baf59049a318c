import { describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import { apiRequest, call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import * as pdfRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/pdf/route';
import { db } from '@/db/client';
import { rebuildFlightRollups } from '@/db/flight-rollups';
import { insertFleet, insertType } from '../fleets/flight-fixtures';

useTestDatabase();

const FLIGHTS = 100_128;

/** 100 128 screened flights in one statement (a recursive row generator), split over two fleets. */
async function bulkFlights(workspaceId: number, fleets: [number, number], types: [number, number]): Promise<void> {
  await db().raw(
    `insert into flights (workspace_id, date, flight, origin, destination, aircraft_type_id, aircraft_code, fleet_id, cruise_fl, max_fl, input_json, status,
       distance_km, fuel_kg, nox_total_kg, nox_above_kg, fraction_above, mean_depth_above_km, ozone_central_kg, ozone_low_kg, ozone_high_kg, engine_version, screened_at, created_at)
     with recursive n(i) as (select 0 union all select i + 1 from n where i + 1 < ?)
     select ?, printf('2026-%02d-%02d', 8 + i % 3, 1 + i % 28), 'BF' || i, 'EFHK', 'RJAA',
       case when i % 3 = 0 then ? else ? end, case when i % 3 = 0 then 'BIG-1' else 'BIG-2' end, case when i % 3 = 0 then ? else ? end,
       370, 390, '{}', 'screened',
       7800 + i % 977, 40449 + i % 1000 * 7, (40449 + i % 1000 * 7) * 0.0143, (40449 + i % 1000 * 7) * 0.0061, 0.43, 0.6,
       (40449 + i % 1000 * 7) * 0.0122, (40449 + i % 1000 * 7) * 0.0024, (40449 + i % 1000 * 7) * 0.055, '2026.12.2', '2026-11-01T00:00:00.000Z', '2026-11-01T00:00:00.000Z'
     from n`,
    [FLIGHTS, workspaceId, types[0], types[1], fleets[0], fleets[1]],
  );
  // Rows written straight into the table: their monthly roll-ups as the worker would keep them.
  await rebuildFlightRollups(db(), workspaceId);
}

describe.skipIf(onPostgres())('a report of a big fleet', () => {
  it(`${FLIGHTS} flights: every number in the PDF is whole (scaled units, no ellipsis), and the totals read back to the sums`, async () => {
    const ws = await makeWorkspace(['analyst']);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const fleetA = await insertFleet(ws.id, 'Polar long-haul A, transpolar and North Pacific rotations');
    const fleetB = await insertFleet(ws.id, 'Polar long-haul B');
    const t1 = await insertType(ws.id, 'BIG-1', fleetA);
    const t2 = await insertType(ws.id, 'BIG-2', fleetB);
    const started = Date.now();
    await bulkFlights(ws.id, [fleetA, fleetB], [t1, t2]);
    expect(Date.now() - started).toBeLessThan(10_000);
    const sums = (await db()('flights')
      .where({ workspace_id: ws.id })
      .sum({ fuel: 'fuel_kg', distance: 'distance_km', nox: 'nox_total_kg', above: 'nox_above_kg' })
      .count({ n: '*' })
      .first()) as {
      fuel: number;
      distance: number;
      nox: number;
      above: number;
      n: number;
    };
    expect(Number(sums.n)).toBe(FLIGHTS);

    const r = await call<{ id: number }>(
      reportsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports`, {
        cookie,
        body: { name: 'Big fleet', from: '2026-08-01', to: '2026-10-31', fleetIds: [fleetA, fleetB] },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    const res = await (
      pdfRoute.GET as unknown as (q: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>
    )(apiRequest('GET', `/api/v1/workspaces/${ws.slug}/reports/${r.body.id}/pdf`, { cookie }), {
      params: Promise.resolve({ slug: ws.slug, id: String(r.body.id) }),
    });
    const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
    const text = (await parser.getText()).text;
    await parser.destroy();
    const flat = text.replace(/\s+/g, ' ');

    expect(text).not.toMatch(/…|\.\.\./);
    // Every figure followed by a unit is a whole number with its unit: no cut digits before a unit.
    const figures = [...flat.matchAll(/(?<!per |[\d,.])(\d[\d,]*(?:\.\d+)?) (Mt|kt|t|kg|million km|km)\b/g)];
    expect(figures.length).toBeGreaterThan(30);
    for (const [, n] of figures) expect(n).toMatch(/^\d{1,3}(,\d{3})*(\.\d+)?$/);
    expect(flat).toContain('100,128');
    // The totals, scaled: 1 Mt = 10^9 kg, 1 kt = 10^6 kg (SI prefixes on the tonne).
    const mt = (kg: number) => `${(kg / 1e9).toFixed(2)} Mt`;
    const kt = (kg: number) =>
      `${(kg / 1e6).toLocaleString('en-GB', { minimumFractionDigits: 1, maximumFractionDigits: 1 })} kt`;
    expect(flat).toContain(mt(Number(sums.fuel)));
    expect(flat).toContain(mt(Number(sums.fuel) * 3.16));
    expect(flat).toContain(kt(Number(sums.nox)));
    expect(flat).toContain(kt(Number(sums.above)));
    expect(flat).toContain(`${(Number(sums.distance) / 1e6).toFixed(1)} million km`);
    // The long fleet name is wrapped, never cut.
    expect(flat).toMatch(/Polar long-haul A, transpolar and North ?Pacific rotations/);
  }, 60_000);
});
