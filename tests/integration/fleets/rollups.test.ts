import { beforeAll, describe, expect, it } from 'vitest';
import { call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import { rebuildFlightRollups, splitByWholeMonths } from '@/db/flight-rollups';
import { deleteFleet, listFleets } from '@/db/fleets';
import { deleteAircraftType } from '@/db/engines';
import { listFlights, summariseFlights } from '@/db/flights';
import { deleteImport, requestImportRescreen, type ImportDto } from '@/db/imports';
import { getMonthlyTrend, getMonthSummaries } from '@/db/portfolio';
import { compareFleets } from '@/lib/fleets/compare';
import type { FleetComparison } from '@/lib/fleets/types';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { ENGINE_VERSION } from '@/lib/screening';
import type { FleetCompareQuery } from '@/lib/validation/fleets';
import { addScheduleLibrary, csv, uploadRequest } from '../imports/support';
import { seed as seedAccounts } from '@/seeds/01_demo_accounts';
import { seed as seedEngines } from '@/seeds/02_demo_engines';
import { seed as seedFlights } from '@/seeds/03_demo_flights';
import { insertFlight, insertType } from './flight-fixtures';
import { expectRollupsMatchRows } from '../../support/rollups';

useTestDatabase({ DEMO_TODAY: '2026-11-20' });

type Row = Record<string, unknown>;
const OLD = '2026.11.0';
const actor = { userId: null, actor: 'test', label: 'test' };

/** Schedule rows over four months; every flight starts or ends at EGLL (the route filter keeps them all). */
function rows(prefix: string, n: number, opts: { fleet?: string; months?: string[] } = {}): string[] {
  const months = opts.months ?? ['2026-08', '2026-09', '2026-10', '2026-11'];
  const pairs: [string, string, number][] = [
    ['EGLL', 'KSEA', 47_000],
    ['EGLL', 'RJAA', 60_000],
    ['KJFK', 'EGLL', 31_000],
    ['EGLL', 'PANC', 42_000],
  ];
  const out: string[] = [];
  for (let i = 0; i < n; i++) {
    const [o, d, fuel] = pairs[i % pairs.length];
    const day = String(1 + ((i * 7) % 28)).padStart(2, '0');
    const type = i % 5 === 4 ? 'T-SST' : 'T-LR';
    const fl = type === 'T-SST' ? 580 : 330 + (i % 4) * 20;
    out.push(
      `${months[i % months.length]}-${day},${prefix}${i},${o},${d},${type},${fl},${fuel + (i % 9) * 250},${opts.fleet ?? ''}`,
    );
  }
  return out;
}

const HEADER = 'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg,fleet';

/** The figures of a comparison that must not depend on where the sums came from. */
function figures(c: FleetComparison) {
  return { rows: c.rows, totals: c.totals, series: c.series, context: c.context, engineVersions: c.engineVersions };
}

function expectSameFigures(a: unknown, b: unknown): void {
  if (typeof a === 'number' && typeof b === 'number') {
    expect(a).toBeCloseTo(b, Math.abs(b) > 1e6 ? 2 : 6);
    return;
  }
  if (Array.isArray(a) && Array.isArray(b)) {
    expect(a.length).toBe(b.length);
    a.forEach((x, i) => expectSameFigures(x, b[i]));
    return;
  }
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    expect(Object.keys(a).sort()).toEqual(Object.keys(b).sort());
    for (const k of Object.keys(a))
      expectSameFigures((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]);
    return;
  }
  expect(a).toEqual(b);
}

describe('monthly roll-ups follow every write of screened flights', () => {
  let ws: Awaited<ReturnType<typeof makeWorkspace>>;
  let lib: { longHaulFleetId: number; studyFleetId: number };
  let importA: number;
  let importB: number;

  beforeAll(async () => {
    ws = await makeWorkspace(['analyst']);
    lib = await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const a = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...rows('RA', 48)), { cookie }),
      {
        slug: ws.slug,
      },
    );
    const b = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...rows('RB', 20, { fleet: 'Study', months: ['2026-10', '2026-11'] })), {
        cookie,
        fileName: 'b.csv',
      }),
      { slug: ws.slug },
    );
    expect([a.status, b.status]).toEqual([202, 202]);
    importA = a.body.id;
    importB = b.body.id;
    await runImportsToCompletion({ chunkSize: 7 });
  });

  const scope = () => ({ workspaceId: ws.id });

  it('equal the sums of the rows after imports screened in chunks', async () => {
    const screened = await db()('flights').where({ workspace_id: ws.id, status: 'screened' }).count({ n: '*' }).first();
    expect(Number(screened?.n)).toBe(68);
    await expectRollupsMatchRows(ws.id);
  });

  it('give the fleet comparison the same figures as the rows, for whole months and for part-months', async () => {
    const cases: Omit<FleetCompareQuery, 'route'>[] = [
      { from: '2026-08-01', to: '2026-11-30', groupBy: 'month' },
      { from: '2026-08-01', to: '2026-11-30', groupBy: 'aircraft' },
      { from: '2026-08-01', to: '2026-11-30', groupBy: 'fleet', fleets: [lib.studyFleetId, lib.longHaulFleetId] },
      { from: '2026-09-01', to: '2026-10-31', groupBy: 'fleet', aircraft: 't-lr', minFl: 340, maxFl: 380 },
      { from: '2026-08-15', to: '2026-11-10', groupBy: 'month' },
      { from: '2026-10-03', to: '2026-10-20', groupBy: 'fleet' },
    ];
    for (const q of cases) {
      // A route filter is answered from the rows alone; EGLL is at one end of every flight here.
      const fromRows = await compareFleets(scope(), { ...q, route: 'EGLL' } as FleetCompareQuery);
      const fromRollups = await compareFleets(scope(), q as FleetCompareQuery);
      expect(fromRows.totals.flights).toBeGreaterThan(0);
      expectSameFigures(figures(fromRollups), figures(fromRows));
    }
  });

  it('give the overview and the fleet list the same figures as the rows', async () => {
    const raw = (await db()('flights')
      .where({ workspace_id: ws.id, status: 'screened' })
      .select(db().raw('substr(date, 1, 7) as month'))
      .count({ n: '*' })
      .sum({ total: 'nox_total_kg', above: 'nox_above_kg', ozone: 'ozone_central_kg' })
      .groupByRaw('substr(date, 1, 7)')) as Row[];
    const rawOf = new Map(raw.map((r) => [String(r.month), r]));
    const trend = await getMonthlyTrend(scope(), 6);
    for (const t of trend) {
      const r = rawOf.get(t.month);
      expect(t.importedFlightsScreened).toBe(Number(r?.n ?? 0));
      expect(t.noxTotalKg).toBeCloseTo(Number(r?.total ?? 0), 6);
      expect(t.noxAboveKg).toBeCloseTo(Number(r?.above ?? 0), 6);
      expect(t.ozoneCentralKg).toBeCloseTo(Number(r?.ozone ?? 0), 6);
    }
    const month = (await getMonthSummaries({ workspaceIds: [ws.id] })).get(ws.id);
    expect(month?.importedFlightsScreened).toBe(Number(rawOf.get('2026-11')?.n));
    expect(month?.noxAboveKg).toBeCloseTo(Number(rawOf.get('2026-11')?.above), 6);

    const fleets = await listFleets(scope());
    const study = fleets.find((f) => f.id === lib.studyFleetId);
    // Study: the 20 flights of import B by their fleet column, and the T-SST flights of import A by type.
    const sst = await db()('flights')
      .where({ workspace_id: ws.id, import_id: importA, aircraft_code: 'T-SST', status: 'screened' })
      .count({ n: '*' })
      .first();
    expect(study?.screenedFlights).toBe(20 + Number(sst?.n));
  });

  it('give the flights page the same totals as the rows, for whole months, part-months and no dates', async () => {
    for (const f of [
      {},
      { from: '2026-09-01', to: '2026-10-31' },
      { from: '2026-09-10', to: '2026-11-05' },
      { from: '2026-10-01', fleet: lib.studyFleetId },
      { to: '2026-09-30', aircraft: 't-lr' },
    ]) {
      const got = await summariseFlights(scope(), f);
      const q = db()('flights').where({ workspace_id: ws.id, status: 'screened' });
      if ('from' in f && f.from) q.where('date', '>=', f.from);
      if ('to' in f && f.to) q.where('date', '<=', f.to);
      if ('fleet' in f) q.where('fleet_id', f.fleet);
      if ('aircraft' in f) q.where('aircraft_code', 'T-LR');
      const want = (await q.count({ n: '*' }).sum({ above: 'nox_above_kg', fuel: 'fuel_kg' }).first()) as Row;
      expect(got.screened).toBe(Number(want.n));
      expect(got.flights).toBe(Number(want.n));
      expect(got.noxAboveTropopauseKg).toBeCloseTo(Number(want.above ?? 0), 6);
      expect(got.fuelKg).toBeCloseTo(Number(want.fuel ?? 0), 6);
    }
  });

  it('follow a re-screen with a newer engine', async () => {
    const ids = (
      (await db()('flights').where({ import_id: importA }).orderBy('id').select('id')) as { id: number }[]
    ).map((r) => r.id);
    // Flights as an older engine left them (lower figures), with roll-ups to match.
    await db()('flights')
      .whereIn('id', ids.slice(0, 30))
      .update({ engine_version: OLD, nox_above_kg: 0, fuel_kg: db().raw('fuel_kg + 1') });
    await rebuildFlightRollups(db(), ws.id);
    await requestImportRescreen(scope(), importA, { engineVersion: ENGINE_VERSION, requestedBy: null, actor: 'test' });
    await runImportsToCompletion({ chunkSize: 4 });
    const versions = await db()('flights').where({ import_id: importA }).distinct('engine_version');
    expect(versions).toEqual([{ engine_version: ENGINE_VERSION }]);
    await expectRollupsMatchRows(ws.id);
  });

  it('follow a deleted fleet and a deleted aircraft type', async () => {
    await deleteFleet(scope(), lib.studyFleetId, actor);
    await expectRollupsMatchRows(ws.id);
    const sst = (await db()('aircraft_types').where({ workspace_id: ws.id, code: 'T-SST' }).first()) as Row;
    await deleteAircraftType(scope(), Number(sst.id), actor);
    await expectRollupsMatchRows(ws.id);
    const whole = await compareFleets(scope(), { from: '2026-08-01', to: '2026-11-30', groupBy: 'fleet' });
    const rowsOnly = await compareFleets(scope(), {
      from: '2026-08-01',
      to: '2026-11-30',
      groupBy: 'fleet',
      route: 'EGLL',
    });
    expectSameFigures(figures(whole), figures(rowsOnly));
  });

  it('follow deleted imports, down to none', async () => {
    await deleteImport(scope(), importB, { userId: null, label: 'test' });
    await expectRollupsMatchRows(ws.id);
    await deleteImport(scope(), importA, { userId: null, label: 'test' });
    await expectRollupsMatchRows(ws.id);
    expect(await db()('flight_month_rollups').where({ workspace_id: ws.id })).toEqual([]);
  });
});

describe('the demo seed', () => {
  it('leaves roll-ups equal to its flights, also when run twice', async () => {
    await seedAccounts(db());
    await seedEngines(db());
    await seedFlights(db());
    await seedFlights(db());
    const spaces = (await db()('workspaces').whereIn('slug', [
      'skarn-polar',
      'velloway-jets',
      'kestrel-mach',
    ])) as Row[];
    expect(spaces).toHaveLength(3);
    for (const w of spaces) {
      expect(await db()('flight_month_rollups').where({ workspace_id: w.id })).not.toEqual([]);
      await expectRollupsMatchRows(Number(w.id));
    }
  });
});

describe('splitting a period into whole months and part-months', () => {
  it.each([
    ['2026-01-01', '2026-12-31', [{ rollup: true, fromMonth: '2026-01', toMonth: '2026-12' }]],
    ['2026-02-01', '2026-02-28', [{ rollup: true, fromMonth: '2026-02', toMonth: '2026-02' }]],
    ['2024-02-01', '2024-02-28', [{ rollup: false, from: '2024-02-01', to: '2024-02-28' }]],
    ['2026-03-05', '2026-03-20', [{ rollup: false, from: '2026-03-05', to: '2026-03-20' }]],
    [
      '2026-03-05',
      '2026-06-10',
      [
        { rollup: false, from: '2026-03-05', to: '2026-03-31' },
        { rollup: true, fromMonth: '2026-04', toMonth: '2026-05' },
        { rollup: false, from: '2026-06-01', to: '2026-06-10' },
      ],
    ],
    [
      '2026-11-15',
      '2027-01-31',
      [
        { rollup: false, from: '2026-11-15', to: '2026-11-30' },
        { rollup: true, fromMonth: '2026-12', toMonth: '2027-01' },
      ],
    ],
    ['2026-04-30', '2026-05-01', [{ rollup: false, from: '2026-04-30', to: '2026-05-01' }]],
  ])('%s to %s', (from, to, want) => {
    expect(splitByWholeMonths(from, to)).toEqual(want);
  });
});

describe('deep pages of the flights list', () => {
  it('walk every flight once, newest first, and a deep page equals the same slice by offset', async () => {
    const ws = await makeWorkspace(['analyst']);
    const type = await insertType(ws.id, 'DP-1', null);
    const dates = ['2026-07-01', '2026-07-02', '2026-07-02', '2026-07-03', '2026-07-05'];
    for (let i = 0; i < 130; i++)
      await insertFlight(ws.id, {
        date: dates[i % dates.length],
        flight: `DP${i}-`,
        typeId: type,
        code: 'DP-1',
        distanceKm: 100,
        fuelKg: 1000,
        noxKg: 10,
        noxAboveKg: 1,
      });
    const reference = (
      (await db()('flights')
        .where({ workspace_id: ws.id })
        .orderBy([
          { column: 'date', order: 'desc' },
          { column: 'id', order: 'desc' },
        ])
        .select('id')) as { id: number }[]
    ).map((r) => Number(r.id));
    const seen: number[] = [];
    let cursor: string | undefined;
    let pages = 0;
    do {
      const page = await listFlights({ workspaceId: ws.id }, { cursor, limit: 7 });
      seen.push(...page.items.map((f) => f.id));
      cursor = page.nextCursor ?? undefined;
      pages += 1;
    } while (cursor && pages < 100);
    expect(seen).toEqual(reference);
    expect(pages).toBe(Math.ceil(130 / 7));

    const deep = reference[99];
    const row = (await db()('flights').where({ id: deep }).first()) as Row;
    const page = await listFlights({ workspaceId: ws.id }, { cursor: `${row.date}~${deep}`, limit: 20 });
    expect(page.items.map((f) => f.id)).toEqual(reference.slice(100, 120));
    const filtered = await listFlights(
      { workspaceId: ws.id },
      { cursor: `${row.date}~${deep}`, limit: 50, from: '2026-07-02', to: '2026-07-03' },
    );
    const inRange = (
      (await db()('flights')
        .where({ workspace_id: ws.id })
        .whereBetween('date', ['2026-07-02', '2026-07-03'])
        .orderBy([
          { column: 'date', order: 'desc' },
          { column: 'id', order: 'desc' },
        ])
        .select('id')) as { id: number }[]
    ).map((r) => Number(r.id));
    expect(filtered.items.map((f) => f.id)).toEqual(inRange.filter((id) => reference.indexOf(id) > 99).slice(0, 50));
  });
});
