import { beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import type { ImportDto } from '@/db/imports';
import { saveBuiltComponents } from '@/db/flight-components';
import { buildComponentBacklog, buildComponents } from '@/lib/imports/components';
import { getReportCsv, getReportPdf } from '@/db/reports';
import { PDFParse } from 'pdf-parse';
import { reportMassRange as formatMassRange } from '@/lib/reports/pdf';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { rescreenImport } from '@/lib/imports/rescreen';
import { compareFleets } from '@/lib/fleets/compare';
import type { FleetPercentiles, FleetPercentilesPending } from '@/lib/fleets/types';
import { fleetPercentiles, FLEET_SAMPLES, FLEET_SEED } from '@/lib/fleets/percentiles';
import { buildFleetReport } from '@/lib/reports/build';
import {
  ENGINE_VERSION,
  decodeFlightComponents,
  encodeFlightComponents,
  flightComponents,
  sampleFleetExact,
  screenValidated,
  type ScreeningInput,
} from '@/lib/screening';
import { addScheduleLibrary, csv, uploadRequest } from '../imports/support';

/** The percentiles, failing the test when they are missing or still pending. */
function ready(p: FleetPercentiles | FleetPercentilesPending | null): FleetPercentiles {
  if (!p || 'pending' in p) throw new Error('fleet percentiles not ready');
  return p;
}

useTestDatabase();

// Invented schedule: great-circle routes between real airports, fuel roughly 6.3 kg per km for a
// long-haul twin (common practice for a plausible order of magnitude), three months, FL330-410.
const PAIRS: [string, string, number][] = [
  ['EFHK', 'RJAA', 52_000],
  ['EGLL', 'KSEA', 47_000],
  ['BIKF', 'PANC', 36_000],
  ['ENGM', 'CYVR', 44_000],
  ['RJAA', 'EFHK', 53_000],
  ['KSEA', 'EGLL', 46_000],
  ['EGLL', 'KJFK', 35_000],
  ['KJFK', 'EGLL', 33_000],
];

function scheduleRows(n: number): string[] {
  const out: string[] = [];
  for (let i = 0; i < n; i++) {
    const [o, d, fuel] = PAIRS[i % PAIRS.length];
    const month = String(9 + (i % 3)).padStart(2, '0');
    const day = String(1 + ((i * 7) % 28)).padStart(2, '0');
    out.push(`2026-${month}-${day},FP${i},${o},${d},T-LR,${330 + (i % 9) * 10},${fuel + (i % 11) * 300}`);
  }
  return out;
}

const HEADER = 'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg';
const PERIOD = { from: '2026-09-01', to: '2026-11-30' };
let ws: Awaited<ReturnType<typeof makeWorkspace>>;
let longHaul: number;
let study: number;

beforeAll(async () => {
  ws = await makeWorkspace(['analyst']);
  ({ longHaulFleetId: longHaul, studyFleetId: study } = await addScheduleLibrary(ws.id));
  // 200 long-haul flights through the import path, and a few direct-EI flights of another fleet.
  const sst = ['2026-10-03,SS1,EGLL,KJFK,T-SST,580,60000', '2026-11-04,SS2,KJFK,EGLL,T-SST,600,60000'];
  const r = await call<ImportDto>(
    importsRoute.POST,
    uploadRequest(ws.slug, csv(HEADER, ...scheduleRows(200), ...sst), {
      cookie: await sessionCookie(ws.members.analyst.id),
    }),
    { slug: ws.slug },
  );
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  await runImportsToCompletion();
}, 120_000);

async function screenedFlights(fleetId: number) {
  return (await db()('flights as fl')
    .join('aircraft_types as at', 'at.id', 'fl.aircraft_type_id')
    .where({ 'fl.workspace_id': ws.id, 'fl.status': 'screened', 'at.default_fleet_id': fleetId })
    .orderBy('fl.id')
    .select('fl.id', 'fl.input_json', 'fl.engine_version')) as {
    id: number;
    input_json: string;
    engine_version: string;
  }[];
}

describe('fleet percentiles from components stored by the import worker', () => {
  it('stores one component row per screened flight, equal to the components of a fresh screening', async () => {
    const flights = await screenedFlights(longHaul);
    expect(flights.length).toBeGreaterThanOrEqual(190);
    const rows = (await db()('flight_components')
      .where({ workspace_id: ws.id })
      .select('flight_id', 'data', 'engine_version')) as {
      flight_id: number;
      data: Uint8Array;
      engine_version: string;
    }[];
    const screenedCount = Number(
      (
        (await db()('flights').where({ workspace_id: ws.id, status: 'screened' }).count({ n: '*' }).first()) as {
          n: number;
        }
      ).n,
    );
    expect(rows.length).toBe(screenedCount);
    const first = flights[0];
    const stored = rows.find((r) => Number(r.flight_id) === Number(first.id));
    expect(stored?.engine_version).toBe(first.engine_version);
    const input = JSON.parse(first.input_json) as ScreeningInput;
    const fresh = decodeFlightComponents(encodeFlightComponents(flightComponents(input, screenValidated(input))));
    expect(decodeFlightComponents(new Uint8Array(stored!.data))).toStrictEqual(fresh);
  });

  it('agrees with a brute-force re-screening of every flight of the fleet (same seed, same draws)', async () => {
    const flights = await screenedFlights(longHaul);
    const p = ready(await fleetPercentiles({ workspaceId: ws.id }, { ...PERIOD, fleetIds: [longHaul] }));
    expect(p).not.toBeNull();
    expect(p.fleets).toHaveLength(1);
    expect(p.fleets[0].flightsSampled).toBe(flights.length);
    expect(p.flightsLeftOut).toBe(0);
    const screenings = flights.map((f) => {
      const input = JSON.parse(f.input_json) as ScreeningInput;
      return { input, result: screenValidated(input) };
    });
    const exact = sampleFleetExact(screenings, { samples: FLEET_SAMPLES, seed: FLEET_SEED });
    // The Monte Carlo error of a 400-sample percentile, from two other seeds of the exact sums: the
    // stored components must agree with the exact re-screening (same draws) within it, and within 3 %.
    const others = [2, 3].map((k) => sampleFleetExact(screenings, { samples: FLEET_SAMPLES, seed: FLEET_SEED + k }));
    for (const key of ['noxAboveTropopauseKg', 'ozoneLossKg'] as const) {
      for (const q of ['p5', 'p50', 'p95'] as const) {
        const got = p.fleets[0][key][q];
        const rel = Math.abs(got - exact[key][q]) / exact[key][q];
        const mc = Math.max(...others.map((o) => Math.abs(o[key][q] - exact[key][q]) / exact[key][q]));
        expect(rel, `${key} ${q}`).toBeLessThan(0.03);
        expect(rel, `${key} ${q} against the seed-to-seed error ${mc}`).toBeLessThan(Math.max(mc, 0.005));
      }
    }
  }, 180_000);

  it('orders the percentiles, samples the total rather than summing bands, and gives the same figures for the seed', async () => {
    const scope = { workspaceId: ws.id };
    const first = ready(await fleetPercentiles(scope, PERIOD));
    expect(first.fleets.map((f) => f.fleetId).sort()).toEqual([longHaul, study].sort());
    for (const row of [...first.fleets, first.total]) {
      for (const key of ['noxAboveTropopauseKg', 'ozoneLossKg', 'fractionAboveTropopause'] as const) {
        expect(row[key].p5).toBeLessThanOrEqual(row[key].p50);
        expect(row[key].p50).toBeLessThanOrEqual(row[key].p95);
      }
    }
    // Stored: the second ask reads the stored result; a fresh sampling gives it again, bit for bit.
    expect(await db()('fleet_percentiles').where({ workspace_id: ws.id }).first()).toBeDefined();
    await db()('fleet_percentiles').where({ workspace_id: ws.id }).delete();
    const again = ready(await fleetPercentiles(scope, PERIOD));
    expect(again).toStrictEqual(first);
    // The total is sampled, not summed: its band is narrower than the sum of the fleets' bands.
    const sumP95 = first.fleets.reduce((t, f) => t + f.noxAboveTropopauseKg.p95, 0);
    const sumP5 = first.fleets.reduce((t, f) => t + f.noxAboveTropopauseKg.p5, 0);
    expect(first.total.noxAboveTropopauseKg.p95 - first.total.noxAboveTropopauseKg.p5).toBeLessThan(sumP95 - sumP5);
    expect(first.total.flightsSampled).toBe(first.fleets.reduce((t, f) => t + f.flightsSampled, 0));
  });

  it('builds components once for flights screened before they were kept, with the same result', async () => {
    const scope = { workspaceId: ws.id };
    const before = ready(await fleetPercentiles(scope, PERIOD));
    await db()('flight_components').where({ workspace_id: ws.id }).delete();
    await db()('fleet_percentiles').where({ workspace_id: ws.id }).delete();
    const after = ready(await fleetPercentiles(scope, PERIOD));
    expect(after).toStrictEqual(before);
    const n = Number(
      ((await db()('flight_components').where({ workspace_id: ws.id }).count({ n: '*' }).first()) as { n: number }).n,
    );
    expect(n).toBe(before.total.flightsSampled);
  });

  it("a re-screen of an import with a newer engine rewrites its flights' components", async () => {
    const imp = (await db()('imports').where({ workspace_id: ws.id }).first('id')) as { id: number };
    // As if screened by an older engine: figures and components both carry its version.
    await db()('flights').where({ import_id: imp.id, status: 'screened' }).update({ engine_version: '2000.1.1' });
    await db()('flight_components').where({ workspace_id: ws.id }).update({ engine_version: '2000.1.1' });
    await rescreenImport({ workspaceId: ws.id }, Number(imp.id), { userId: null, label: 'test' });
    await runImportsToCompletion();
    const versions = (await db()('flight_components')
      .where({ workspace_id: ws.id })
      .groupBy('engine_version')
      .select('engine_version')
      .count({ n: '*' })) as { engine_version: string; n: number }[];
    expect(versions.map((v) => v.engine_version)).toEqual([ENGINE_VERSION]);
    const p = ready(await fleetPercentiles({ workspaceId: ws.id }, PERIOD));
    expect(p.flightsLeftOut).toBe(0);
    expect(p.engineVersion).toBe(ENGINE_VERSION);
  });

  it('answers pending while more flights lack components than a request may build, and the worker then builds them', async () => {
    const scope = { workspaceId: ws.id };
    const all = ready(await fleetPercentiles(scope, PERIOD));
    await db()('flight_components').where({ workspace_id: ws.id }).delete();
    await db()('fleet_percentiles').where({ workspace_id: ws.id }).delete();
    const pending = await fleetPercentiles(scope, PERIOD, { lazyLimit: 10 });
    expect(pending).toEqual({ pending: true, flightsPending: all.total.flights, flights: all.total.flights });
    expect(await db()('fleet_percentiles').where({ workspace_id: ws.id }).first()).toBeUndefined();
    // The worker's backlog (after imports and re-screens) builds them; the band is then the same.
    await buildComponentBacklog(async () => false);
    expect(ready(await fleetPercentiles(scope, PERIOD, { lazyLimit: 10 }))).toStrictEqual(all);
  });

  it('builds components only for screened flights, and never stores components older than the figures', async () => {
    const other = await makeWorkspace(['analyst']);
    await addScheduleLibrary(other.id);
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(other.slug, csv(HEADER, ...scheduleRows(3)), {
        cookie: await sessionCookie(other.members.analyst.id),
      }),
      { slug: other.slug },
    );
    expect(r.status, JSON.stringify(r.body)).toBe(202);
    // One stored input the engine cannot read: that flight fails screening.
    const last = (await db()('flights').where({ import_id: r.body.id }).orderBy('id', 'desc').first('id')) as {
      id: number;
    };
    await db()('flights').where({ id: last.id }).update({ input_json: '{"route":{}}' });
    await runImportsToCompletion();
    const flights = (await db()('flights').where({ import_id: r.body.id }).orderBy('id').select('id', 'status')) as {
      id: number;
      status: string;
    }[];
    const failed = flights.filter((f) => f.status === 'failed');
    expect(failed).toHaveLength(1);
    expect(await db()('flight_components').where({ flight_id: failed[0].id }).first()).toBeUndefined();
    const screened = flights.filter((f) => f.status === 'screened').map((f) => Number(f.id));
    expect(
      ((await db()('flight_components').whereIn('flight_id', screened).select('flight_id')) as unknown[]).length,
    ).toBe(screened.length);
    // Components built for figures that were re-screened meanwhile are not stored.
    const [id] = screened;
    await db()('flight_components').where({ flight_id: id }).delete();
    const stale = await buildComponents([{ id, workspaceId: other.id, engineVersion: '2000.1.1', inputJson: '{}' }], {
      threads: false,
    });
    expect(await saveBuiltComponents(stale)).toBe(0);
    expect(await db()('flight_components').where({ flight_id: id }).first()).toBeUndefined();
  });
});

describe('fleet percentiles in the product', () => {
  it('the fleet comparison carries the band per fleet and in total, with the correlation in plain words', async () => {
    const c = await compareFleets({ workspaceId: ws.id }, { ...PERIOD, groupBy: 'fleet' });
    const cp = ready(c.percentiles);
    expect(cp.samples).toBe(400);
    expect(cp.fleets).toHaveLength(2);
    expect(cp.note).toMatch(/half shared by the flights of the same 10-degree latitude band and month/);
    expect(cp.note).toMatch(/gross catalytic loss/);
    // The page's figures are the data function's for the same selection.
    expect(c.percentiles).toStrictEqual(ready(await fleetPercentiles({ workspaceId: ws.id }, PERIOD)));
    // A filter that keeps no flight has no band.
    const none = await compareFleets(
      { workspaceId: ws.id },
      { from: '2025-01-01', to: '2025-01-31', groupBy: 'fleet' },
    );
    expect(none.percentiles).toBeNull();
  });

  it('a fleet report states the band in its summary (JSON), its CSV and the correlation text', async () => {
    const report = await buildFleetReport(
      { workspaceId: ws.id },
      {
        ...PERIOD,
        fleetIds: [longHaul, study],
        workspaceName: 'Percentile test',
        units: 'metric',
        createdBy: null,
        actor: 'test',
        actorName: 'Test',
      },
    );
    const summary = report.summary;
    expect(summary.percentiles?.fleets).toHaveLength(2);
    const { csv: text } = await getReportCsv({ workspaceId: ws.id }, report.id);
    const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
    const totals = parsed.data.filter((r) => r.month === 'total');
    expect(totals).toHaveLength(3);
    for (const t of totals) {
      expect(Number(t.nox_above_tropopause_p5_kg)).toBeGreaterThan(0);
      expect(Number(t.nox_above_tropopause_p95_kg)).toBeGreaterThan(Number(t.nox_above_tropopause_p5_kg));
      expect(Number(t.ozone_loss_p95_kg)).toBeGreaterThan(Number(t.ozone_loss_p5_kg));
    }
    const last = totals[totals.length - 1];
    expect(Number(last.nox_above_tropopause_p5_kg)).toBeCloseTo(summary.percentiles!.total.noxAboveTropopauseKg.p5, 3);
    expect(parsed.data.filter((r) => r.month !== 'total').every((r) => r.nox_above_tropopause_p5_kg === '')).toBe(true);
    // The PDF has the band table and says in plain words how the sampling correlates the inputs.
    const { pdf } = await getReportPdf({ workspaceId: ws.id }, report.id);
    const parser = new PDFParse({ data: new Uint8Array(pdf) });
    const pdfText = (await parser.getText()).text.replace(/\s+/g, ' ');
    await parser.destroy();
    expect(pdfText).toContain('How sure: 5-95 % of each total from correlated sampling');
    expect(pdfText).toContain(
      formatMassRange(
        summary.percentiles!.total.noxAboveTropopauseKg.p5,
        summary.percentiles!.total.noxAboveTropopauseKg.p95,
        'metric',
        ' to ',
      ),
    );
    expect(pdfText).toMatch(/half shared by the flights of the same 10-degree latitude band and month/);
  });
});
