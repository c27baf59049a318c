import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as flightsRoute from '@/app/api/v1/workspaces/[slug]/flights/route';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import * as reportPdfRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/pdf/route';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { PDFParse } from 'pdf-parse';
import { db } from '@/db/client';
import { HEADER, addScheduleLibrary, csv, uploadRequest } from '../imports/support';

useTestDatabase();

type ErrorBody = {
  error: { code: string; message: string; fields?: { path: string; message: string }[] };
  problems?: { line: number; column: string; message: string }[];
};

// EGLL-EHAM is about 370 km great circle; 73 t over it is about 200 kg/km, far beyond any aircraft
// (today's largest airliners burn about 12-15 kg/km in cruise, common practice).
const SHORT_HEAVY = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'EHAM' }] },
  cruise: { flightLevel: 350 },
  fuelBurnKg: 73_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

describe('fuel against distance', () => {
  it('an impossible burn is refused by the preview and the save with the field named, and nothing is saved or billed', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    for (const [route, path] of [
      [previewRoute, `/api/v1/workspaces/${ws.slug}/screenings/preview`],
      [screeningsRoute, `/api/v1/workspaces/${ws.slug}/screenings`],
    ] as const) {
      const r = await call<ErrorBody>(route.POST, apiRequest('POST', path, { cookie, body: SHORT_HEAVY }), {
        slug: ws.slug,
      });
      expect(r.status, path).toBe(422);
      const field = r.body.error.fields?.find((f) => f.path === 'fuelBurnKg');
      expect(field?.message).toMatch(/kg per km: no aircraft burns that/);
    }
    expect(await db()('screenings').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
  });

  it('an unusual burn is screened, with the warning first among the cautions of the preview and of the saved screening', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    // About 25 kg/km: above the usual band, below the impossible one.
    const body = { ...SHORT_HEAVY, fuelBurnKg: 9_300 };
    const preview = await call<{ result: { cautions: string[] } }>(
      previewRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, { cookie, body }),
      { slug: ws.slug },
    );
    expect(preview.status).toBe(200);
    expect(preview.body.result.cautions[0]).toMatch(
      /^Unusual fuel: 9,300 kg of fuel over \d+ km is 25 kg per km, outside the usual 0.50-20 kg per km/,
    );
    const saved = await call<{ id: number; result: { cautions: string[] } }>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body }),
      { slug: ws.slug },
    );
    expect(saved.status).toBe(201);
    expect(saved.body.result.cautions[0]).toMatch(/^Unusual fuel:/);
    const stored = await db()('screenings').where({ id: saved.body.id }).first();
    expect(JSON.stringify(stored)).toContain('Unusual fuel:');
  });

  it('a usual burn carries no fuel warning', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<{ result: { cautions: string[] } }>(
      previewRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, {
        cookie,
        body: { ...SHORT_HEAVY, fuelBurnKg: 2_000 },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(200);
    expect(r.body.result.cautions.some((c) => c.startsWith('Unusual fuel'))).toBe(false);
  });

  it('the schedule import refuses an impossible row by line and column, and lists an unusual one as a warning on its line', async () => {
    const ws = await makeWorkspace(['analyst']);
    await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const refused = await call<ErrorBody>(
      importsRoute.POST,
      uploadRequest(
        ws.slug,
        csv(HEADER, '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400', '2026-11-03,TP2,EGLL,EHAM,T-LR,350,73000'),
      ),
      { slug: ws.slug },
    );
    // uploadRequest without a cookie is refused before the rows are read: send it signed in.
    expect(refused.status).toBe(401);
    const r = await call<ErrorBody>(
      importsRoute.POST,
      uploadRequest(
        ws.slug,
        csv(HEADER, '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400', '2026-11-03,TP2,EGLL,EHAM,T-LR,350,73000'),
        { cookie },
      ),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual([
      expect.objectContaining({
        line: 3,
        column: 'fuel_kg',
        message: expect.stringMatching(/no aircraft of this type burns that .* for T-LR/),
      }),
    ]);

    // EGLL-EHAM with 4 t on T-LR (two engines of 1.2 kg/s at take-off): about 11 kg/km, above its usual band.
    const ok = await call<{ id: number; problems: { line: number; column: string; message: string }[] }>(
      importsRoute.POST,
      uploadRequest(
        ws.slug,
        csv(HEADER, '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400', '2026-11-03,TP3,EGLL,EHAM,T-LR,350,4000'),
        { cookie },
      ),
      { slug: ws.slug },
    );
    expect(ok.status).toBe(202);
    // Warnings of an accepted import are listed with it, by line and column.
    expect(ok.body.problems).toEqual([
      expect.objectContaining({
        line: 3,
        column: 'fuel_kg',
        message: expect.stringMatching(/^Unusual fuel: 4,000 kg .* for T-LR/),
      }),
    ]);
    const stored = await db()('import_problems').where({ import_id: ok.body.id, column: 'fuel_kg' });
    expect(stored.map((p) => p.line)).toEqual([3]);
  });

  it('an imported flight with unusual fuel keeps its warning: in the flights list and in a report that includes it', async () => {
    const ws = await makeWorkspace(['analyst']);
    const lib = await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const up = await call<{ id: number }>(
      importsRoute.POST,
      uploadRequest(
        ws.slug,
        csv(HEADER, '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400', '2026-11-04,TP3,EGLL,EHAM,T-LR,350,4000'),
        { cookie },
      ),
      { slug: ws.slug },
    );
    expect(up.status).toBe(202);
    await runImportsToCompletion();
    const list = await call<{ items: { flight: string; fuelWarning: string | null }[] }>(
      flightsRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights?import=${up.body.id}`, { cookie }),
      { slug: ws.slug },
    );
    const byFlight = Object.fromEntries(list.body.items.map((f) => [f.flight, f.fuelWarning]));
    expect(byFlight.TP1).toBeNull();
    expect(byFlight.TP3).toMatch(/^Unusual fuel: 4,000 kg/);

    const report = await call<{ id: number; summary: { fuelWarnings?: { count: number } } }>(
      reportsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports`, {
        cookie,
        body: { name: 'November', from: '2026-11-01', to: '2026-11-20', fleetIds: [lib.longHaulFleetId] },
      }),
      { slug: ws.slug },
    );
    expect(report.status).toBe(201);
    expect(report.body.summary.fuelWarnings?.count).toBe(1);
    const res = await (
      reportPdfRoute.GET as unknown as (q: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>
    )(apiRequest('GET', `/api/v1/workspaces/${ws.slug}/reports/${report.body.id}/pdf`, { cookie }), {
      params: Promise.resolve({ slug: ws.slug, id: String(report.body.id) }),
    });
    const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
    const text = (await parser.getText()).text.replace(/\s+/g, ' ');
    await parser.destroy();
    expect(text).toContain('Flights with unusual fuel');
    expect(text).toMatch(/1 of the 2 flights in this report have a fuel burn that is unusual/);
    expect(text).toContain('EGLL-EHAM');
  });
});
