import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeUser, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as routesRoute from '@/app/api/v1/workspaces/[slug]/routes/route';
import * as routeRoute from '@/app/api/v1/workspaces/[slug]/routes/[id]/route';
import { db } from '@/db/client';
import { createApiKey } from '@/lib/auth/api-keys';

useTestDatabase();

type RouteBody = { id: number; name: string; waypoints: unknown[]; notes: string; distanceKm: number };

const base = (slug: string) => `/api/v1/workspaces/${slug}/routes`;
const post = async (slug: string, cookie: string, body: unknown) =>
  call<RouteBody>(routesRoute.POST, apiRequest('POST', base(slug), { cookie, body }), { slug });

describe('saved routes API', () => {
  it('201 saves a route (codes in capitals, distance on the mean sphere); GET lists and reads it', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await post(ws.slug, cookie, {
      name: 'Polar north',
      waypoints: [{ airport: 'egll' }, { lat: 80, lon: -60 }, { airport: 'KSEA' }],
      notes: 'Winter track',
    });
    expect(r.status).toBe(201);
    expect(r.body.waypoints).toEqual([{ airport: 'EGLL' }, { lat: 80, lon: -60 }, { airport: 'KSEA' }]);
    expect(r.body.notes).toBe('Winter track');
    // Via 80N 60W the track is longer than the EGLL-KSEA great circle (about 7 700 km, a fact of the trade).
    expect(r.body.distanceKm).toBeGreaterThan(7_700);
    const list = await call<{ items: RouteBody[] }>(routesRoute.GET, apiRequest('GET', base(ws.slug), { cookie }), {
      slug: ws.slug,
    });
    expect(list.status).toBe(200);
    expect(list.body.items.map((i) => i.name)).toEqual(['Polar north']);
    const one = await call<RouteBody>(routeRoute.GET, apiRequest('GET', `${base(ws.slug)}/${r.body.id}`, { cookie }), {
      slug: ws.slug,
      id: String(r.body.id),
    });
    expect(one.status).toBe(200);
    expect(one.body.distanceKm).toBeCloseTo(r.body.distanceKm, 6);
  });

  it('a one-leg route measures as the engine measures it: a quarter meridian is pi R / 2', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const r = await post(ws.slug, cookie, {
      name: 'Quarter meridian',
      waypoints: [
        { lat: 0, lon: 0 },
        { lat: 90, lon: 0 },
      ],
    });
    expect(r.status).toBe(201);
    // IUGG mean Earth radius R1 = 6371.0088 km (Moritz 1980, Geodetic Reference System 1980).
    expect(r.body.distanceKm).toBeCloseTo((Math.PI / 2) * 6371.0088, 0);
  });

  it('401 without a session; 403 for a viewer writing; the viewer still reads', async () => {
    const ws = await makeWorkspace(['viewer']);
    const anon = await call(
      routesRoute.POST,
      apiRequest('POST', base(ws.slug), { body: { name: 'x', waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] } }),
      { slug: ws.slug },
    );
    expect(anon.status).toBe(401);
    const viewer = await sessionCookie(ws.members.viewer.id);
    const denied = await post(ws.slug, viewer, { name: 'x', waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] });
    expect(denied.status).toBe(403);
    expect(await db()('routes').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
    const read = await call(routesRoute.GET, apiRequest('GET', base(ws.slug), { cookie: viewer }), { slug: ws.slug });
    expect(read.status).toBe(200);
  });

  it('a viewer API key reads but cannot write (403)', async () => {
    const ws = await makeWorkspace();
    const { key } = await createApiKey(
      { workspaceId: ws.id },
      { name: 'read', role: 'viewer', createdBy: ws.owner.id, actor: ws.owner.email },
    );
    const denied = await call(
      routesRoute.POST,
      apiRequest('POST', base(ws.slug), {
        bearer: key,
        body: { name: 'x', waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
      }),
      { slug: ws.slug },
    );
    expect(denied.status).toBe(403);
    const read = await call(routesRoute.GET, apiRequest('GET', base(ws.slug), { bearer: key }), { slug: ws.slug });
    expect(read.status).toBe(200);
  });

  it('404 for another workspace and for an unknown id; a route of another workspace cannot be read, changed or deleted', async () => {
    const mine = await makeWorkspace();
    const theirs = await makeWorkspace();
    const cookie = await sessionCookie(mine.owner.id);
    const otherCookie = await sessionCookie(theirs.owner.id);
    const theirRoute = await post(theirs.slug, otherCookie, {
      name: 'Theirs',
      waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }],
    });
    expect(theirRoute.status).toBe(201);
    const strange = await call(routesRoute.GET, apiRequest('GET', base(theirs.slug), { cookie }), {
      slug: theirs.slug,
    });
    expect(strange.status).toBe(404);
    const id = String(theirRoute.body.id);
    for (const [handler, method] of [
      [routeRoute.GET, 'GET'],
      [routeRoute.PATCH, 'PATCH'],
      [routeRoute.DELETE, 'DELETE'],
    ] as const) {
      const r = await call(
        handler,
        apiRequest(method, `${base(mine.slug)}/${id}`, {
          cookie,
          body: method === 'PATCH' ? { notes: 'mine now' } : undefined,
        }),
        { slug: mine.slug, id },
      );
      expect(r.status).toBe(404);
    }
    const unknown = await call(routeRoute.GET, apiRequest('GET', `${base(mine.slug)}/999999`, { cookie }), {
      slug: mine.slug,
      id: '999999',
    });
    expect(unknown.status).toBe(404);
    const notAnId = await call(routeRoute.GET, apiRequest('GET', `${base(mine.slug)}/abc`, { cookie }), {
      slug: mine.slug,
      id: 'abc',
    });
    expect(notAnId.status).toBe(404);
    expect((await db()('routes').where({ id: theirRoute.body.id }).first()).notes).toBe('');
  });

  it('409 with a field error for a name already used (any letter case); PATCH to a taken name is 409 too', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const wp = [{ airport: 'EGLL' }, { airport: 'KJFK' }];
    expect((await post(ws.slug, cookie, { name: 'Atlantic A', waypoints: wp })).status).toBe(201);
    const b = await post(ws.slug, cookie, { name: 'Atlantic B', waypoints: wp });
    const dup = await post(ws.slug, cookie, { name: 'atlantic a', waypoints: wp });
    expect(dup.status).toBe(409);
    expect(dup.body.error?.fields).toEqual([{ path: 'name', message: expect.stringContaining('already') }]);
    const rename = await call(
      routeRoute.PATCH,
      apiRequest('PATCH', `${base(ws.slug)}/${b.body.id}`, { cookie, body: { name: 'Atlantic A' } }),
      { slug: ws.slug, id: String(b.body.id) },
    );
    expect(rename.status).toBe(409);
  });

  it('422 names each bad waypoint by path: unknown airport codes, bad coordinates, too few points; nothing saved', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const unknown = await post(ws.slug, cookie, {
      name: 'Bad',
      waypoints: [{ airport: 'EGLL' }, { airport: 'ZZZZ' }, { airport: 'QQQ' }],
    });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error?.fields?.map((f) => f.path)).toEqual(['waypoints.1.airport', 'waypoints.2.airport']);
    const shape = await post(ws.slug, cookie, {
      name: '',
      waypoints: [{ lat: 95, lon: 0 }, { airport: 'E' }],
      notes: 'x'.repeat(2001),
    });
    expect(shape.status).toBe(422);
    expect(shape.body.error?.fields?.map((f) => f.path).sort()).toEqual(
      ['name', 'notes', 'waypoints.0.lat', 'waypoints.1.airport'].sort(),
    );
    const short = await post(ws.slug, cookie, { name: 'One point', waypoints: [{ airport: 'EGLL' }] });
    expect(short.status).toBe(422);
    expect(short.body.error?.fields?.[0].path).toBe('waypoints');
    const broken = await call(
      routesRoute.POST,
      apiRequest('POST', base(ws.slug), {
        cookie,
        rawBody: '{"name":',
        headers: { 'content-type': 'application/json' },
      }),
      { slug: ws.slug },
    );
    expect(broken.status).toBe(400);
    expect(await db()('routes').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
  });

  it('PATCH keeps what is not sent; DELETE is 204 and the route is gone', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await post(ws.slug, cookie, {
      name: 'Keep',
      waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }],
      notes: 'first',
    });
    const id = String(r.body.id);
    const patched = await call<RouteBody>(
      routeRoute.PATCH,
      apiRequest('PATCH', `${base(ws.slug)}/${id}`, { cookie, body: { notes: 'second' } }),
      { slug: ws.slug, id },
    );
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({
      name: 'Keep',
      notes: 'second',
      waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }],
    });
    const badPatch = await call(
      routeRoute.PATCH,
      apiRequest('PATCH', `${base(ws.slug)}/${id}`, {
        cookie,
        body: { waypoints: [{ airport: 'EGLL' }, { airport: 'NOPE' }] },
      }),
      { slug: ws.slug, id },
    );
    expect(badPatch.status).toBe(422);
    expect(badPatch.body.error?.fields?.[0].path).toBe('waypoints.1.airport');
    const del = await call(routeRoute.DELETE, apiRequest('DELETE', `${base(ws.slug)}/${id}`, { cookie }), {
      slug: ws.slug,
      id,
    });
    expect(del.status).toBe(204);
    const gone = await call(routeRoute.GET, apiRequest('GET', `${base(ws.slug)}/${id}`, { cookie }), {
      slug: ws.slug,
      id,
    });
    expect(gone.status).toBe(404);
  });

  it('a signed-in stranger gets 404 for the workspace', async () => {
    const ws = await makeWorkspace();
    const stranger = await makeUser('stranger');
    const r = await call(
      routesRoute.GET,
      apiRequest('GET', base(ws.slug), { cookie: await sessionCookie(stranger.id) }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(404);
  });
});
