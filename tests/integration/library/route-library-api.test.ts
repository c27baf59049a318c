import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { multipartRequest } from './multipart';
import * as fixesRoute from '@/app/api/v1/workspaces/[slug]/fixes/route';
import * as fixRoute from '@/app/api/v1/workspaces/[slug]/fixes/[id]/route';
import * as fixUploadRoute from '@/app/api/v1/workspaces/[slug]/fixes/upload/route';
import * as airwaysRoute from '@/app/api/v1/workspaces/[slug]/airways/route';
import * as airwayRoute from '@/app/api/v1/workspaces/[slug]/airways/[id]/route';
import * as airwayUploadRoute from '@/app/api/v1/workspaces/[slug]/airways/upload/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import { legDistanceKm } from '@/lib/screening/great-circle';

useTestDatabase();

// Invented names and positions (no real navigation data).
const FIX_CSV = 'name,lat,lon,region\nQXORV,62,-20,east\nQXTEL,64,-30,\nQXPAS,65,-40,\nQXORV,-40,100,far south\n';
const AIRWAY_CSV = 'airway,sequence,fix\nXN7,10,QXORV\nXN7,20,QXTEL\nXN7,30,QXPAS\n';
type Problems = { problems: { line: number; column: string; message: string }[] };
type Fix = { id: number; name: string; region: string; lat: number; lon: number };
type FlightPlan = {
  waypoints: { lat: number; lon: number; name?: string }[];
  cruise: { steps: { fromKm: number; flightLevel: number }[] };
  unresolved: { item: string; position: number | null; reason: string }[];
  notes: string[];
};
type Preview = { result: { flightPlan: FlightPlan; levels: { flightLevel: number }[] }; levels: unknown[] };

const base = (slug: string) => `/api/v1/workspaces/${slug}`;
const FLIGHT = { cruise: { flightLevel: 330 }, fuelBurnKg: 40_000, emission: { eiNoxGPerKg: 14 }, month: 1 };

async function stocked() {
  const ws = await makeWorkspace(['planner', 'analyst', 'viewer']);
  const cookie = await sessionCookie(ws.members.planner.id);
  const f = await call<{ added: number }>(
    fixUploadRoute.POST,
    multipartRequest(`${base(ws.slug)}/fixes/upload`, { cookie, csv: FIX_CSV }),
    { slug: ws.slug },
  );
  expect(f.status).toBe(201);
  const a = await call<{ added: number }>(
    airwayUploadRoute.POST,
    multipartRequest(`${base(ws.slug)}/airways/upload`, { cookie, csv: AIRWAY_CSV }),
    { slug: ws.slug },
  );
  expect(a.status).toBe(201);
  return { ws, cookie };
}

describe('fix and airway libraries', () => {
  it('a planner uploads fixes and airways; everyone in the workspace lists and searches them', async () => {
    const { ws } = await stocked();
    const viewer = await sessionCookie(ws.members.viewer.id);
    const list = await call<{ items: Fix[] }>(
      fixesRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/fixes?q=qxo`, { cookie: viewer }),
      { slug: ws.slug },
    );
    expect(list.status).toBe(200);
    expect(list.body.items.map((f) => [f.name, f.region])).toEqual([
      ['QXORV', 'east'],
      ['QXORV', 'far south'],
    ]);
    const airways = await call<{ items: { name: string; fixes: string[] }[] }>(
      airwaysRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/airways`, { cookie: viewer }),
      { slug: ws.slug },
    );
    expect(airways.body.items).toMatchObject([{ name: 'XN7', fixes: ['QXORV', 'QXTEL', 'QXPAS'] }]);
  });

  it('an analyst or viewer may not edit (403); a re-upload moves a fix of the same name and region', async () => {
    const { ws, cookie } = await stocked();
    for (const role of ['analyst', 'viewer'] as const) {
      const c = await sessionCookie(ws.members[role].id);
      const r = await call(
        fixUploadRoute.POST,
        multipartRequest(`${base(ws.slug)}/fixes/upload`, { cookie: c, csv: FIX_CSV }),
        { slug: ws.slug },
      );
      expect(r.status).toBe(403);
    }
    const again = await call<{ added: number; updated: number }>(
      fixesRoute.POST,
      apiRequest('POST', `${base(ws.slug)}/fixes`, {
        cookie,
        body: {
          fixes: [
            { name: 'qxtel', lat: 64.5, lon: -30 },
            { name: 'QXMIR', lat: 70, lon: -10 },
          ],
        },
      }),
      { slug: ws.slug },
    );
    expect(again.status).toBe(201);
    expect(again.body).toEqual({ added: 1, updated: 1 });
    const list = await call<{ items: Fix[] }>(
      fixesRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/fixes?q=QXTEL`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items).toMatchObject([{ name: 'QXTEL', lat: 64.5 }]);
  });

  it('bad files are refused by line and column, nothing saved', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<Problems>(
      fixUploadRoute.POST,
      multipartRequest(`${base(ws.slug)}/fixes/upload`, {
        cookie,
        csv: 'name,lat,lon\nGOOD,10,10\nX,95,10\nGOOD,11,11\n',
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    expect(r.body.problems.map((p) => [p.line, p.column])).toEqual([
      [3, 'name'],
      [3, 'lat'],
      [4, 'name'],
    ]);
    const a = await call<Problems>(
      airwayUploadRoute.POST,
      multipartRequest(`${base(ws.slug)}/airways/upload`, {
        cookie,
        csv: 'airway,sequence,fix\nQN1,1,AAA\nQN1,1,BBB\nQN2,x,CCC\n',
      }),
      { slug: ws.slug },
    );
    expect(a.status).toBe(422);
    expect(a.body.problems.map((p) => [p.line, p.column])).toEqual([
      [3, 'sequence'],
      [4, 'sequence'],
      // QN1 is left with one point once its repeated sequence is refused.
      [2, 'fix'],
    ]);
    const list = await call<{ items: Fix[] }>(fixesRoute.GET, apiRequest('GET', `${base(ws.slug)}/fixes`, { cookie }), {
      slug: ws.slug,
    });
    expect(list.body.items).toEqual([]);
  });

  it('delete removes a fix or an airway; another workspace gets 404', async () => {
    const { ws, cookie } = await stocked();
    const other = await makeWorkspace();
    const otherCookie = await sessionCookie(other.owner.id);
    const fixes = await call<{ items: Fix[] }>(
      fixesRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/fixes?q=QXPAS`, { cookie }),
      { slug: ws.slug },
    );
    const id = String(fixes.body.items[0].id);
    const foreign = await call(
      fixRoute.DELETE,
      apiRequest('DELETE', `${base(other.slug)}/fixes/${id}`, { cookie: otherCookie }),
      { slug: other.slug, id },
    );
    expect(foreign.status).toBe(404);
    const del = await call(fixRoute.DELETE, apiRequest('DELETE', `${base(ws.slug)}/fixes/${id}`, { cookie }), {
      slug: ws.slug,
      id,
    });
    expect(del.status).toBe(204);
    const airways = await call<{ items: { id: number }[] }>(
      airwaysRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/airways`, { cookie }),
      { slug: ws.slug },
    );
    const aid = String(airways.body.items[0].id);
    expect(
      (
        await call(airwayRoute.DELETE, apiRequest('DELETE', `${base(ws.slug)}/airways/${aid}`, { cookie }), {
          slug: ws.slug,
          id: aid,
        })
      ).status,
    ).toBe(204);
    const after = await call<{ items: unknown[] }>(
      airwaysRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/airways`, { cookie }),
      { slug: ws.slug },
    );
    expect(after.body.items).toEqual([]);
  });
});

describe('screening a flight-plan route through the workspace library', () => {
  it('preview: named points and the airway come from the library, the level change sits at its point, unplaced items are kept', async () => {
    const { ws, cookie } = await stocked();
    const text = 'N0480F350 DCT QXORV XN7 QXPAS/N0480F370 DCT NOWHR DCT 66N050W DCT';
    const r = await call<Preview>(
      previewRoute.POST,
      apiRequest('POST', `${base(ws.slug)}/screenings/preview`, {
        cookie,
        body: { ...FLIGHT, route: { flightPlan: { text, from: 'EGLL', to: 'CYYZ' } } },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(200);
    const fp = r.body.result.flightPlan;
    expect(fp.waypoints.map((w) => w.name)).toEqual(['EGLL', 'QXORV', 'QXTEL', 'QXPAS', '66N050W', 'CYYZ']);
    // The QXORV near the route (region east), not the one in the southern hemisphere.
    expect(fp.waypoints[1]).toMatchObject({ lat: 62, lon: -20 });
    const w = fp.waypoints;
    let km = 0;
    for (let i = 0; i < 3; i++) km += legDistanceKm(w[i].lat, w[i].lon, w[i + 1].lat, w[i + 1].lon);
    expect(fp.cruise.steps).toEqual([
      { fromKm: 0, flightLevel: 350 },
      { fromKm: km, flightLevel: 370 },
    ]);
    expect(fp.unresolved).toEqual([
      { item: 'NOWHR', position: text.indexOf('NOWHR'), reason: 'NOWHR is not in the fix library.' },
    ]);
    expect(r.body.result.levels.map((l) => l.flightLevel)).toEqual([350, 370]);
    expect(r.body.levels.length).toBeGreaterThan(1);
  });

  it('save: 201 keeps the flight-plan input and what was understood; the list labels it by its aerodromes', async () => {
    const { ws, cookie } = await stocked();
    const body = {
      ...FLIGHT,
      route: { flightPlan: { text: 'N0480F350 DCT QXORV DCT QXTEL DCT', from: 'EGLL', to: 'CYYZ' } },
    };
    const r = await call<{ id: number; input: typeof body; result: { flightPlan: FlightPlan } }>(
      screeningsRoute.POST,
      apiRequest('POST', `${base(ws.slug)}/screenings`, { cookie, body }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    expect(r.body.input.route).toEqual(body.route);
    expect(r.body.result.flightPlan.waypoints).toHaveLength(4);
    const list = await call<{ items: { routeLabel: string }[] }>(
      screeningsRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/screenings`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items[0].routeLabel).toBe('EGLL → CYYZ (flight plan)');
  });

  it.each([
    [{ text: 'N0480F350 DCT', from: 'EGLL', to: 'ZZZZ' }, 'route.flightPlan.to'],
    [{ text: '   ', from: 'EGLL', to: 'CYYZ' }, 'route.flightPlan.text'],
    [{ text: 'N0480F350', from: 'EGLL' }, 'route.flightPlan.to'],
  ])('an unusable flight plan is a 422 naming the field: %o', async (flightPlan, path) => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<{ error: { fields: { path: string }[] } }>(
      previewRoute.POST,
      apiRequest('POST', `${base(ws.slug)}/screenings/preview`, { cookie, body: { ...FLIGHT, route: { flightPlan } } }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    expect(r.body.error.fields.map((f) => f.path)).toContain(path);
  });
});
