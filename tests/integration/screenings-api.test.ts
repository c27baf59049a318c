import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { apiRequest, call, makeUser, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as screeningRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import * as atmosphereRoute from '@/app/api/v1/atmosphere/route';
import * as tropopauseRoute from '@/app/api/v1/tropopause/route';
import * as airportsRoute from '@/app/api/v1/airports/route';
import * as openapiRoute from '@/app/api/v1/openapi.json/route';
import { db, insertId } from '@/db/client';
import { createApiKey } from '@/lib/auth/api-keys';

useTestDatabase();

const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KSFO' }] },
  cruise: { flightLevel: 390 },
  fuelBurnKg: 60_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

type Saved = {
  id: number;
  name: string;
  createdAt: string;
  input: unknown;
  result: { noxTotalKg: number; fuelKg: number; segments: unknown[] };
};

describe('POST /workspaces/{slug}/screenings', () => {
  it('201 saves the screening with exactly one usage row; GET returns it', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<Saved>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie,
        body: { ...FLIGHT, name: 'LHR-SFO winter' },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    expect(r.body.name).toBe('LHR-SFO winter');
    // NOx = fuel x EI for a direct EI (definition of the emission index).
    expect(r.body.result.noxTotalKg).toBeCloseTo(60_000 * 14e-3, 6);
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    const got = await call<Saved>(
      screeningRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(got.status).toBe(200);
    expect(got.body.result.noxTotalKg).toBe(r.body.result.noxTotalKg);
    const list = await call<{ items: { id: number; routeLabel: string }[]; nextCursor: string | null }>(
      screeningsRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings?limit=10`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items.map((i) => i.id)).toContain(r.body.id);
    expect(list.body.items[0].routeLabel).toBe('EGLL → KSFO');
  });

  it('an Idempotency-Key retry returns the first screening and adds no second unit', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const send = () =>
      call<Saved>(
        screeningsRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
          cookie,
          body: FLIGHT,
          headers: { 'idempotency-key': 'retry-1' },
        }),
        { slug: ws.slug },
      );
    const a = await send();
    const b = await send();
    expect(a.status).toBe(201);
    expect(b.status).toBe(200);
    expect(b.body.id).toBe(a.body.id);
    expect(await db()('screenings').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
  });

  it('the same Idempotency-Key with a different body is a 409 naming the key; nothing saved or billed', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const send = (body: unknown) =>
      call<Saved & { error: { code: string; message: string; idempotencyKey: string } }>(
        screeningsRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
          cookie,
          body,
          headers: { 'idempotency-key': 'order-77' },
        }),
        { slug: ws.slug },
      );
    const a = await send(FLIGHT);
    expect(a.status).toBe(201);
    const b = await send({ ...FLIGHT, fuelBurnKg: 61_000 });
    expect(b.status).toBe(409);
    expect(b.body.error.code).toBe('conflict');
    expect(b.body.error.message).toContain('order-77');
    expect(b.body.error.idempotencyKey).toBe('order-77');
    // Same body with its keys in another order is the same request: the first result comes back.
    const reordered = Object.fromEntries(Object.entries(FLIGHT).reverse());
    const c = await send(reordered);
    expect(c.status).toBe(200);
    expect(c.body.id).toBe(a.body.id);
    expect(await db()('screenings').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
  });

  it('an aircraft type of the workspace supplies emission and Mach', async () => {
    const ws = await makeWorkspace();
    const now = new Date().toISOString();
    const engineId = await insertId(
      db()('engines')
        .insert({
          workspace_id: ws.id,
          name: 'E',
          ff_idle_kg_s: 0.1,
          ff_approach_kg_s: 0.3,
          ff_climb_out_kg_s: 0.9,
          ff_take_off_kg_s: 1.1,
          ei_idle_g_kg: 5,
          ei_approach_g_kg: 11,
          ei_climb_out_g_kg: 23,
          ei_take_off_g_kg: 30,
          created_at: now,
          updated_at: now,
        })
        .returning('id'),
    );
    await db()('aircraft_types').insert({
      workspace_id: ws.id,
      code: 'T-1',
      engine_id: engineId,
      engine_count: 2,
      typical_mach: 0.82,
      typical_flight_level: 370,
      created_at: now,
      updated_at: now,
    });
    const { emission: _e, ...noEmission } = FLIGHT;
    const r = await call<Saved & { aircraft: string; result: { eiMethod: string } }>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie: await sessionCookie(ws.owner.id),
        body: { ...noEmission, aircraft: 't-1' },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    expect(r.body.aircraft).toBe('T-1');
    expect(r.body.result.eiMethod).toBe('bffm2');
    const unknown = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie: await sessionCookie(ws.owner.id),
        body: { ...noEmission, aircraft: 'NOPE' },
      }),
      { slug: ws.slug },
    );
    expect(unknown.status).toBe(422);
    expect(unknown.body.error?.fields?.map((f) => f.path)).toEqual(expect.arrayContaining(['aircraft']));
  });

  it('422 lists each bad field by path and saves nothing; 400 for broken JSON', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const bad = { ...FLIGHT, route: { waypoints: [{ lat: 95, lon: 0 }, { airport: 'ZZZZ' }] }, fuelBurnKg: -5 };
    const r = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: bad }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    const paths = r.body.error?.fields?.map((f) => f.path) ?? [];
    expect(paths).toEqual(expect.arrayContaining(['route.waypoints.0.lat', 'fuelBurnKg']));
    const unknownAirport = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie,
        body: { ...FLIGHT, route: { waypoints: [{ airport: 'EGLL' }, { airport: 'ZZZZ' }] } },
      }),
      { slug: ws.slug },
    );
    expect(unknownAirport.status).toBe(422);
    expect(unknownAirport.body.error?.fields?.[0]?.path).toBe('route.waypoints.1.airport');
    const broken = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie,
        rawBody: '{',
        headers: { 'content-type': 'application/json' },
      }),
      { slug: ws.slug },
    );
    expect(broken.status).toBe(400);
    expect(await db()('screenings').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
  });

  it('401 unauthenticated, 403 viewer, 404 other workspace and unknown id, 413 oversized', async () => {
    const ws = await makeWorkspace(['viewer']);
    const other = await makeWorkspace();
    const url = `/api/v1/workspaces/${ws.slug}/screenings`;
    expect(
      (await call(screeningsRoute.POST, apiRequest('POST', url, { body: FLIGHT }), { slug: ws.slug })).status,
    ).toBe(401);
    expect(
      (
        await call(
          screeningsRoute.POST,
          apiRequest('POST', url, { cookie: await sessionCookie(ws.members.viewer.id), body: FLIGHT }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await call(screeningsRoute.GET, apiRequest('GET', url, { cookie: await sessionCookie(ws.members.viewer.id) }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await call(
          screeningsRoute.POST,
          apiRequest('POST', url, { cookie: await sessionCookie(other.owner.id), body: FLIGHT }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await call(
          screeningRoute.GET,
          apiRequest('GET', `${url}/424242`, { cookie: await sessionCookie(ws.owner.id) }),
          { slug: ws.slug, id: '424242' },
        )
      ).status,
    ).toBe(404);
    const saved = await call<Saved>(
      screeningsRoute.POST,
      apiRequest('POST', url, { cookie: await sessionCookie(ws.owner.id), body: FLIGHT }),
      { slug: ws.slug },
    );
    expect(
      (
        await call(
          screeningRoute.GET,
          apiRequest('GET', `/api/v1/workspaces/${other.slug}/screenings/${saved.body.id}`, {
            cookie: await sessionCookie(other.owner.id),
          }),
          { slug: other.slug, id: String(saved.body.id) },
        )
      ).status,
    ).toBe(404);
    const huge = { ...FLIGHT, name: 'x'.repeat(1_200_000) };
    expect(
      (
        await call(
          screeningsRoute.POST,
          apiRequest('POST', url, { cookie: await sessionCookie(ws.owner.id), body: huge }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(413);
  });

  it('an API key acts in its workspace with its role', async () => {
    const ws = await makeWorkspace();
    const key = await createApiKey(
      { workspaceId: ws.id },
      { name: 'k', role: 'planner', createdBy: ws.owner.id, actor: 't' },
    );
    const r = await call<Saved>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { bearer: key.key, body: FLIGHT }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    expect(await db()('screenings').where({ id: r.body.id }).first()).toMatchObject({
      api_key_id: key.id,
      created_by: null,
    });
  });

  it('402 while the workspace is past due; nothing saved', async () => {
    const ws = await makeWorkspace();
    await db()('workspace_billing')
      .insert({ workspace_id: ws.id, plan_id: 'x', status: 'past_due', updated_at: new Date().toISOString() })
      .onConflict('workspace_id')
      .merge();
    const r = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie: await sessionCookie(ws.owner.id),
        body: FLIGHT,
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(402);
    expect(await db()('screenings').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
  });
});

describe('preview and computation routes', () => {
  it('preview screens without saving or billing and adds the what-if levels', async () => {
    const ws = await makeWorkspace();
    const r = await call<{ result: { noxTotalKg: number }; levels: { flightLevel: number; lowestImpact: boolean }[] }>(
      previewRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, {
        cookie: await sessionCookie(ws.owner.id),
        body: { ...FLIGHT, whatIf: { maxFuelPenaltyPct: 3 } },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(200);
    expect(r.body.levels.map((l) => l.flightLevel)).toEqual([350, 370, 390, 410, 430]);
    expect(r.body.levels.filter((l) => l.lowestImpact)).toHaveLength(1);
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
    const bad = await call(
      previewRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, {
        cookie: await sessionCookie(ws.owner.id),
        body: { ...FLIGHT, whatIf: { maxFuelPenaltyPct: 99 } },
      }),
      { slug: ws.slug },
    );
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.[0]?.path).toBe('whatIf.maxFuelPenaltyPct');
  });

  it('preview: the planner chooses what the mark minimises (named in each row, with the fuel and CO2 change); a fuel burn far beyond the engine is a 422 on fuelBurnKg', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const url = `/api/v1/workspaces/${ws.slug}/screenings/preview`;
    const r = await call<{
      levels: {
        lowestImpact: boolean;
        markName: string;
        minimise: string;
        noxAboveTropopauseKg: number;
        withinLimit: boolean;
        co2ChangeKg: number;
        fuelChangeKg: number;
      }[];
    }>(
      previewRoute.POST,
      apiRequest('POST', url, { cookie, body: { ...FLIGHT, whatIf: { minimise: 'nox-above-tropopause' } } }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(200);
    const marked = r.body.levels.find((l) => l.lowestImpact)!;
    expect(marked.markName).toBe('Least NOx above the tropopause');
    for (const l of r.body.levels.filter((x) => x.withinLimit))
      expect(marked.noxAboveTropopauseKg).toBeLessThanOrEqual(l.noxAboveTropopauseKg);
    for (const l of r.body.levels) expect(l.co2ChangeKg).toBeCloseTo(3.16 * l.fuelChangeKg, 6);
    const bad = await call(
      previewRoute.POST,
      apiRequest('POST', url, { cookie, body: { ...FLIGHT, whatIf: { minimise: 'co2' } } }),
      { slug: ws.slug },
    );
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.[0]?.path).toBe('whatIf.minimise');
    const engine = {
      engine: { fuelFlowKgS: [0.11, 0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10.0, 22.5, 28.8] },
      engineCount: 2,
    };
    const far = await call(
      previewRoute.POST,
      apiRequest('POST', url, { cookie, body: { ...FLIGHT, fuelBurnKg: 450_000, emission: engine } }),
      { slug: ws.slug },
    );
    expect(far.status).toBe(422);
    expect(far.body.error?.fields?.map((f: { path: string }) => f.path)).toEqual(['fuelBurnKg']);
    expect(far.body.error?.fields?.[0]?.message).toMatch(/kg\/s per engine/);
  });

  it('atmosphere: 11 000 m is the ISA tropopause and FL361 lies just above it (ICAO Doc 7488/3: 11 000 m, 216.65 K, 22 632 Pa, isothermal above)', async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u.id);
    const r = await call<{ temperatureK: number; pressurePa: number }>(
      atmosphereRoute.GET,
      apiRequest('GET', '/api/v1/atmosphere?altitudeM=11000', { cookie }),
    );
    expect(r.body.temperatureK).toBeCloseTo(216.65, 2);
    expect(r.body.pressurePa).toBeCloseTo(22632, -1);
    // FL361 = 11 003.28 m: the same temperature, and a pressure a few pascals lower (about 22 620 Pa).
    const fl361 = await call<{ temperatureK: number; pressurePa: number; altitudeM: number }>(
      atmosphereRoute.GET,
      apiRequest('GET', '/api/v1/atmosphere?flightLevel=361', { cookie }),
    );
    expect(fl361.status).toBe(200);
    expect(fl361.body.altitudeM).toBeCloseTo(11_003.28, 2);
    expect(fl361.body.temperatureK).toBeCloseTo(216.65, 2);
    expect(fl361.body.pressurePa).toBeLessThan(22_632);
    expect(fl361.body.pressurePa).toBeGreaterThan(22_610);
    expect(
      (await call(atmosphereRoute.GET, apiRequest('GET', '/api/v1/atmosphere?altitudeM=40000', { cookie }))).status,
    ).toBe(422);
    expect((await call(atmosphereRoute.GET, apiRequest('GET', '/api/v1/atmosphere?flightLevel=350'))).status).toBe(401);
  });

  it('tropopause from levels; 422 names the bad level', async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u.id);
    // A constructed sounding: 6.5 K/km up to 11 km, isothermal above, so the WMO tropopause is at 11 km.
    const levels = Array.from({ length: 21 }, (_, i) => ({
      altitudeM: i * 1000,
      temperatureK: i <= 11 ? 288.15 - 6.5 * i : 216.65,
    }));
    const r = await call<{ tropopause: { altitudeM: number } | null }>(
      tropopauseRoute.POST,
      apiRequest('POST', '/api/v1/tropopause', { cookie, body: { levels } }),
    );
    expect(r.status).toBe(200);
    expect(r.body.tropopause?.altitudeM).toBeCloseTo(11000, -2);
    const bad = await call(
      tropopauseRoute.POST,
      apiRequest('POST', '/api/v1/tropopause', {
        cookie,
        body: { levels: [{ altitudeM: 0, temperatureK: 20 }, ...levels.slice(1)] },
      }),
    );
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.[0]?.path).toBe('levels.0.temperatureK');
  });

  it('airports type-ahead finds EGLL and caps at 20', async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u.id);
    const r = await call<{ items: { icao: string; iata: string }[] }>(
      airportsRoute.GET,
      apiRequest('GET', '/api/v1/airports?q=EGLL', { cookie }),
    );
    expect(r.body.items[0]).toMatchObject({ icao: 'EGLL', iata: 'LHR' });
    const many = await call<{ items: unknown[] }>(
      airportsRoute.GET,
      apiRequest('GET', '/api/v1/airports?q=a', { cookie }),
    );
    expect(many.body.items.length).toBeLessThanOrEqual(20);
    expect((await call(airportsRoute.GET, apiRequest('GET', '/api/v1/airports?q=', { cookie }))).status).toBe(422);
  });
});

describe('OpenAPI document', () => {
  it('documents every v1 route file and method', async () => {
    const doc = (await (await openapiRoute.GET()).json()) as { paths: Record<string, Record<string, unknown>> };
    const root = path.resolve('app/api/v1');
    const walk = (dir: string): string[] =>
      fs
        .readdirSync(dir, { withFileTypes: true })
        .flatMap((e) =>
          e.isDirectory() ? walk(path.join(dir, e.name)) : e.name === 'route.ts' ? [path.join(dir, e.name)] : [],
        );
    for (const file of walk(root)) {
      const apiPath = `/${path.relative(root, path.dirname(file))}`.replace(/\[(\w+)\]/g, '{$1}').replace(/\\/g, '/');
      const src = fs.readFileSync(file, 'utf8');
      const methods = [...src.matchAll(/export (?:const|async function|function) (GET|POST|PUT|PATCH|DELETE)\b/g)].map(
        (m) => m[1].toLowerCase(),
      );
      expect(doc.paths, `${apiPath} missing from openapi`).toHaveProperty([apiPath]);
      for (const m of methods) expect(doc.paths[apiPath], `${m} ${apiPath} missing`).toHaveProperty(m);
    }
  });
});
