import { beforeAll, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as compareRoute from '@/app/api/v1/workspaces/[slug]/fleets/compare/route';
import { aggregateFlights, resolveFlightFleets } from '@/db/fleets';
import { compareFleets } from '@/lib/fleets/compare';
import type { FleetComparison } from '@/lib/fleets/types';
import { insertFleet, insertFlight, insertType, type FlightFixture } from './flight-fixtures';

useTestDatabase();

let ws: Awaited<ReturnType<typeof makeWorkspace>>;
let fleetA: number;
let fleetB: number;
let cookie: string;
let ids: Record<string, number>;
let flights: (FlightFixture & { id: number; name: string })[];

beforeAll(async () => {
  ws = await makeWorkspace(['analyst', 'viewer', 'billing']);
  cookie = await sessionCookie(ws.members.analyst.id);
  fleetA = await insertFleet(ws.id, 'Long-haul A');
  fleetB = await insertFleet(ws.id, 'Long-haul B');
  const t1 = await insertType(ws.id, 'LR-1', fleetA);
  const t2 = await insertType(ws.id, 'LR-2', fleetB);
  const t3 = await insertType(ws.id, 'XX-9', null);
  const defs: (FlightFixture & { name: string })[] = [
    // Type default fleet A.
    {
      name: 'a1',
      date: '2026-09-03',
      flight: 'TP1',
      typeId: t1,
      code: 'LR-1',
      distanceKm: 8000,
      fuelKg: 60000,
      noxKg: 900,
      noxAboveKg: 450,
      cruiseFl: 370,
      maxFl: 390,
    },
    {
      name: 'a2',
      date: '2026-10-12',
      flight: 'TP2',
      origin: 'EKCH',
      destination: 'RJTT',
      typeId: t1,
      code: 'LR-1',
      distanceKm: 2000,
      fuelKg: 15000,
      noxKg: 100,
      noxAboveKg: 10,
      cruiseFl: 350,
    },
    // Type default A, but the schedule's fleet column says B: B wins.
    {
      name: 'ab',
      date: '2026-10-20',
      flight: 'TP3',
      typeId: t1,
      code: 'LR-1',
      fleetId: fleetB,
      distanceKm: 5000,
      fuelKg: 40000,
      noxKg: 500,
      noxAboveKg: 100,
      cruiseFl: 410,
    },
    // Type default fleet B.
    {
      name: 'b1',
      date: '2026-11-02',
      flight: 'TP4',
      origin: 'KJFK',
      destination: 'EGLL',
      typeId: t2,
      code: 'LR-2',
      distanceKm: 5500,
      fuelKg: 50000,
      noxKg: 700,
      noxAboveKg: 0,
      cruiseFl: 330,
    },
    // No fleet at all.
    {
      name: 'n1',
      date: '2026-11-05',
      flight: 'TP5',
      typeId: t3,
      code: 'XX-9',
      distanceKm: 1000,
      fuelKg: 5000,
      noxKg: 60,
      noxAboveKg: 30,
      cruiseFl: 430,
    },
    // Not screened yet / outside the period: never counted.
    {
      name: 'pending',
      date: '2026-10-01',
      flight: 'TP6',
      typeId: t1,
      code: 'LR-1',
      distanceKm: 1,
      fuelKg: 1,
      noxKg: 1,
      noxAboveKg: 1,
      status: 'pending',
    },
    {
      name: 'old',
      date: '2026-05-01',
      flight: 'TP7',
      typeId: t1,
      code: 'LR-1',
      distanceKm: 1,
      fuelKg: 1,
      noxKg: 1,
      noxAboveKg: 1,
    },
  ];
  ids = {};
  flights = [];
  for (const d of defs) {
    const id = await insertFlight(ws.id, d);
    ids[d.name] = id;
    flights.push({ ...d, id });
  }
});

const PERIOD = { from: '2026-09-01', to: '2026-11-20' };

async function compare(query: Record<string, string>, user = cookie) {
  const qs = new URLSearchParams({ ...PERIOD, ...query }).toString();
  return call<FleetComparison>(
    compareRoute.GET,
    apiRequest('GET', `/api/v1/workspaces/${ws.slug}/fleets/compare?${qs}`, { cookie: user }),
    { slug: ws.slug },
  );
}

const counted = () => flights.filter((f) => f.status !== 'pending' && f.date >= PERIOD.from && f.date <= PERIOD.to);
const sum = (list: FlightFixture[], k: 'distanceKm' | 'fuelKg' | 'noxKg' | 'noxAboveKg') =>
  list.reduce((s, f) => s + f[k], 0);

describe('fleet resolution', () => {
  it("a flight's own fleet (CSV fleet column) overrides its type's default; no fleet stays unassigned", async () => {
    const resolved = await resolveFlightFleets({ workspaceId: ws.id }, [ids.a1, ids.ab, ids.b1, ids.n1]);
    expect(resolved.get(ids.a1)).toBe(fleetA);
    expect(resolved.get(ids.ab)).toBe(fleetB);
    expect(resolved.get(ids.b1)).toBe(fleetB);
    expect(resolved.get(ids.n1)).toBeNull();
  });

  it('a fleet of another workspace named on a flight does not count', async () => {
    const other = await makeWorkspace();
    const foreign = await insertFleet(other.id, 'Foreign');
    const t = await insertType(ws.id, 'ZZ-1', fleetA);
    const id = await insertFlight(ws.id, {
      date: '2026-06-01',
      flight: 'FX',
      typeId: t,
      code: 'ZZ-1',
      fleetId: foreign,
      distanceKm: 1,
      fuelKg: 1,
      noxKg: 1,
      noxAboveKg: 0,
    });
    expect((await resolveFlightFleets({ workspaceId: ws.id }, [id])).get(id)).toBeNull();
  });
});

describe('GET /fleets/compare', () => {
  it('totals equal the sums of their flights, per fleet and overall, in the API and the data layer', async () => {
    const r = await compare({});
    expect(r.status).toBe(200);
    const list = counted();
    expect(r.body.totals.flights).toBe(list.length);
    expect(r.body.totals.distanceKm).toBeCloseTo(sum(list, 'distanceKm'), 6);
    expect(r.body.totals.fuelKg).toBeCloseTo(sum(list, 'fuelKg'), 6);
    expect(r.body.totals.noxTotalKg).toBeCloseTo(sum(list, 'noxKg'), 6);
    expect(r.body.totals.noxAboveKg).toBeCloseTo(sum(list, 'noxAboveKg'), 6);
    // CO2 = 3.16 kg per kg of fuel (ICAO CORSIA conversion factor).
    expect(r.body.totals.co2Kg).toBeCloseTo(sum(list, 'fuelKg') * 3.16, 6);

    const byFleet = new Map(r.body.rows.map((row) => [row.fleetId, row]));
    const inA = list.filter((f) => f.name === 'a1' || f.name === 'a2');
    const inB = list.filter((f) => f.name === 'ab' || f.name === 'b1');
    expect(byFleet.get(fleetA)?.flights).toBe(2);
    expect(byFleet.get(fleetA)?.noxAboveKg).toBeCloseTo(sum(inA, 'noxAboveKg'), 6);
    expect(byFleet.get(fleetB)?.flights).toBe(2);
    expect(byFleet.get(fleetB)?.fuelKg).toBeCloseTo(sum(inB, 'fuelKg'), 6);
    expect(byFleet.get(null)?.fleetName).toBe('No fleet');

    const agg = await aggregateFlights({ workspaceId: ws.id }, { ...PERIOD });
    expect(agg.reduce((s, a) => s + a.noxTotalKg, 0)).toBeCloseTo(r.body.totals.noxTotalKg, 6);
    expect(agg.reduce((s, a) => s + a.flights, 0)).toBe(r.body.totals.flights);
    const direct = await compareFleets({ workspaceId: ws.id }, { ...PERIOD, groupBy: 'fleet' });
    expect(direct.totals).toEqual(r.body.totals);
  });

  it('ratios of the totals row come from the sums, not from averaging the rows', async () => {
    const r = await compare({});
    const list = counted();
    const share = sum(list, 'noxAboveKg') / sum(list, 'noxKg');
    expect(r.body.totals.shareAbove).toBeCloseTo(share, 12);
    const meanOfShares = r.body.rows.reduce((s, row) => s + (row.shareAbove ?? 0), 0) / r.body.rows.length;
    expect(Math.abs(meanOfShares - share)).toBeGreaterThan(0.01);
    expect(r.body.totals.noxAbovePer1000KmKg).toBeCloseTo(
      (sum(list, 'noxAboveKg') / sum(list, 'distanceKm')) * 1000,
      9,
    );
    expect(r.body.totals.ozone.lowKg).toBeLessThanOrEqual(r.body.totals.ozone.centralKg);
    expect(r.body.totals.ozone.highKg).toBeGreaterThanOrEqual(r.body.totals.ozone.centralKg);
  });

  it('grouped by month and by aircraft, the rows add up to the same totals', async () => {
    const byMonth = await compare({ groupBy: 'month' });
    expect(byMonth.body.rows.every((r) => /^\d{4}-\d{2}$/.test(r.month ?? ''))).toBe(true);
    expect(byMonth.body.rows.reduce((s, r) => s + r.noxAboveKg, 0)).toBeCloseTo(byMonth.body.totals.noxAboveKg, 6);
    const aOct = byMonth.body.rows.find((r) => r.fleetId === fleetA && r.month === '2026-10');
    expect(aOct?.flights).toBe(1);
    const byType = await compare({ groupBy: 'aircraft' });
    expect(new Set(byType.body.rows.map((r) => `${r.fleetName}/${r.aircraftCode}`))).toEqual(
      new Set(['Long-haul A/LR-1', 'Long-haul B/LR-1', 'Long-haul B/LR-2', 'No fleet/XX-9']),
    );
    expect(byType.body.rows.reduce((s, r) => s + r.fuelKg, 0)).toBeCloseTo(byType.body.totals.fuelKg, 6);
  });

  it('monthly series cover every month of the period, per fleet', async () => {
    const r = await compare({});
    expect(r.body.months).toEqual(['2026-09', '2026-10', '2026-11']);
    const a = r.body.series.find((s) => s.fleetId === fleetA);
    expect(a?.noxAboveKg).toEqual([450, 10, 0]);
    expect(a?.shareAbove[0]).toBeCloseTo(0.5, 12);
    expect(a?.shareAbove[2]).toBeNull();
  });

  it.each([
    ['aircraft', { aircraft: 'lr-2' }, ['b1']],
    ['route by ICAO code', { route: 'RJTT' }, ['a2']],
    ['route by IATA code (Tokyo Haneda = RJTT)', { route: 'HND' }, ['a2']],
    ['route origin and destination', { route: 'KJFK-EGLL' }, ['b1']],
    ['level band touching the cruise (370-390 step climb counts)', { minFl: '385', maxFl: '420' }, ['a1', 'ab']],
    ['level band below', { maxFl: '340' }, ['b1']],
    ['period', { from: '2026-10-01', to: '2026-10-31' }, ['a2', 'ab']],
    ['fleets', { fleets: '' }, ['a1', 'a2', 'ab', 'b1', 'n1']],
  ] as [string, Record<string, string>, string[]][])('filter: %s', async (_label, query, expected) => {
    const r = await compare(query);
    expect(r.status).toBe(200);
    const list = flights.filter((f) => expected.includes(f.name));
    expect(r.body.totals.flights).toBe(list.length);
    expect(r.body.totals.noxTotalKg).toBeCloseTo(sum(list, 'noxKg'), 6);
  });

  it('filter by fleet ids keeps only those fleets', async () => {
    const r = await compare({ fleets: String(fleetB) });
    expect(r.body.rows.map((x) => x.fleetId)).toEqual([fleetB]);
    expect(r.body.totals.flights).toBe(2);
  });

  it('the fleet-scale context is not applicable below the altitudes the studies cover', async () => {
    const r = await compare({});
    for (const s of r.body.context.total.studies) {
      expect(s.applicable).toBe(false);
      expect(s.columnChangePct).toBeNull();
      expect(s.note).toMatch(/Not applicable/);
    }
    const days = 81; // 2026-09-01 .. 2026-11-20 inclusive
    expect(r.body.period.days).toBe(days);
    expect(r.body.context.total.annualNoxAboveKg).toBeCloseTo((sum(counted(), 'noxAboveKg') * 365.25) / days, 6);
    expect(r.body.cautions.join(' ')).toMatch(/not a certified emissions inventory/);
    expect(r.body.notes.co2).toMatch(/3\.16.*CORSIA/);
  });

  it('422 names the bad filter; 401 signed out; 404 other workspace; 403 finance admin; viewer may read', async () => {
    const bad = await compare({ minFl: 'high', groupBy: 'week' });
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.map((f) => f.path).sort()).toEqual(['groupBy', 'minFl']);
    const order = await compare({ from: '2026-11-01', to: '2026-10-01' });
    expect(order.status).toBe(422);
    expect(order.body.error?.fields?.[0]?.path).toBe('to');
    const band = await compare({ minFl: '400', maxFl: '300' });
    expect(band.body.error?.fields?.[0]?.path).toBe('maxFl');
    const tooLong = await compare({ from: '2020-01-01', to: '2026-11-01' });
    expect(tooLong.status).toBe(422);
    const badDate = await compare({ from: '2026-02-30' });
    expect(badDate.body.error?.fields?.[0]?.path).toBe('from');
    const url = `/api/v1/workspaces/${ws.slug}/fleets/compare`;
    expect((await call(compareRoute.GET, apiRequest('GET', url), { slug: ws.slug })).status).toBe(401);
    const other = await makeWorkspace();
    expect(
      (
        await call(compareRoute.GET, apiRequest('GET', url, { cookie: await sessionCookie(other.owner.id) }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(404);
    expect((await compare({}, await sessionCookie(ws.members.billing.id))).status).toBe(403);
    expect((await compare({}, await sessionCookie(ws.members.viewer.id))).status).toBe(200);
  });
});

describe('fleet-scale context at supersonic altitudes', () => {
  it('scales the study results linearly inside their altitude bands with a +/-50 % band', async () => {
    const sst = await makeWorkspace();
    const fleet = await insertFleet(sst.id, 'Supersonic');
    const t = await insertType(sst.id, 'SST', fleet);
    // FL580 = 17 678 m ISA pressure altitude, about 17.73 km geometric: inside 17-20 km only.
    await insertFlight(sst.id, {
      date: '2026-01-10',
      flight: 'SS1',
      typeId: t,
      code: 'SST',
      cruiseFl: 580,
      distanceKm: 6000,
      fuelKg: 70000,
      noxKg: 800,
      noxAboveKg: 800,
    });
    const r = await compareFleets({ workspaceId: sst.id }, { from: '2026-01-01', to: '2026-01-31', groupBy: 'fleet' });
    const c = r.context.fleets[0];
    const annual = (800 * 365.25) / 31;
    expect(c.annualNoxAboveKg).toBeCloseTo(annual, 6);
    const zhang = c.studies.find((s) => s.study === 'zhang-2023');
    const eastham = c.studies.find((s) => s.study === 'eastham-2022');
    expect(eastham?.applicable).toBe(false);
    expect(zhang?.applicable).toBe(true);
    // Zhang et al. 2023 (Earth's Future, e2022EF003409): 1.78 Tg NOx/yr at 17-20 km -> -0.74 % column ozone.
    const central = (-0.74 / 1.78e9) * annual;
    expect(zhang?.columnChangePct?.central).toBeCloseTo(central, 15);
    expect(zhang?.columnChangePct?.low).toBeCloseTo(central * 0.5, 15);
    expect(zhang?.columnChangePct?.high).toBeCloseTo(central * 1.5, 15);
  });
});
