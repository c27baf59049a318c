import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as fleetsRoute from '@/app/api/v1/workspaces/[slug]/fleets/route';
import * as fleetRoute from '@/app/api/v1/workspaces/[slug]/fleets/[id]/route';
import { db } from '@/db/client';
import { resolveFlightFleets } from '@/db/fleets';
import type { FleetDto } from '@/db/fleets';
import { insertFlight, insertType } from './flight-fixtures';

useTestDatabase();

const path = (slug: string, id?: number) => `/api/v1/workspaces/${slug}/fleets${id ? `/${id}` : ''}`;

describe('fleets API', () => {
  it('an analyst creates, lists, renames and describes a fleet; the name is unique', async () => {
    const ws = await makeWorkspace(['analyst']);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const created = await call<FleetDto>(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie, body: { name: '  Polar A ', description: 'Transpolar' } }),
      { slug: ws.slug },
    );
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      name: 'Polar A',
      description: 'Transpolar',
      aircraftTypes: [],
      screenedFlights: 0,
    });
    const dup = await call(fleetsRoute.POST, apiRequest('POST', path(ws.slug), { cookie, body: { name: 'polar a' } }), {
      slug: ws.slug,
    });
    expect(dup.status).toBe(409);
    expect(dup.body.error?.fields?.[0]?.path).toBe('name');
    const list = await call<{ items: FleetDto[] }>(fleetsRoute.GET, apiRequest('GET', path(ws.slug), { cookie }), {
      slug: ws.slug,
    });
    expect(list.body.items.map((f) => f.name)).toEqual(['Polar A']);
    const renamed = await call<FleetDto>(
      fleetRoute.PATCH,
      apiRequest('PATCH', path(ws.slug, created.body.id), { cookie, body: { name: 'Polar North' } }),
      { slug: ws.slug, id: String(created.body.id) },
    );
    expect(renamed.status).toBe(200);
    expect(renamed.body.name).toBe('Polar North');
    expect(renamed.body.description).toBe('Transpolar');
    const got = await call<FleetDto>(fleetRoute.GET, apiRequest('GET', path(ws.slug, created.body.id), { cookie }), {
      slug: ws.slug,
      id: String(created.body.id),
    });
    expect(got.body.name).toBe('Polar North');
    const audit = await db()('audit_log')
      .where({ workspace_id: ws.id })
      .whereIn('action', ['fleet.create', 'fleet.update'])
      .count({ n: '*' })
      .first();
    expect(audit).toMatchObject({ n: 2 });
  });

  it('PATCH aircraftTypeIds sets exactly which types default to the fleet; flights follow', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const a = await call<FleetDto>(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie, body: { name: 'A' } }),
      { slug: ws.slug },
    );
    const b = await call<FleetDto>(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie, body: { name: 'B' } }),
      { slug: ws.slug },
    );
    const t1 = await insertType(ws.id, 'T-1', a.body.id);
    const t2 = await insertType(ws.id, 'T-2', null);
    const f1 = await insertFlight(ws.id, {
      date: '2026-10-01',
      flight: 'X',
      typeId: t1,
      code: 'T-1',
      distanceKm: 1,
      fuelKg: 1,
      noxKg: 1,
      noxAboveKg: 0,
    });
    const r = await call<FleetDto>(
      fleetRoute.PATCH,
      apiRequest('PATCH', path(ws.slug, b.body.id), { cookie, body: { aircraftTypeIds: [t1, t2] } }),
      { slug: ws.slug, id: String(b.body.id) },
    );
    expect(r.status).toBe(200);
    expect(r.body.aircraftTypes.map((t) => t.code)).toEqual(['T-1', 'T-2']);
    expect(r.body.screenedFlights).toBe(1);
    expect((await resolveFlightFleets({ workspaceId: ws.id }, [f1])).get(f1)).toBe(b.body.id);
    const cleared = await call<FleetDto>(
      fleetRoute.PATCH,
      apiRequest('PATCH', path(ws.slug, b.body.id), { cookie, body: { aircraftTypeIds: [t2] } }),
      { slug: ws.slug, id: String(b.body.id) },
    );
    expect(cleared.body.aircraftTypes.map((t) => t.code)).toEqual(['T-2']);
    expect(await db()('aircraft_types').where({ id: t1 }).first()).toMatchObject({ default_fleet_id: null });
    const unknown = await call(
      fleetRoute.PATCH,
      apiRequest('PATCH', path(ws.slug, b.body.id), { cookie, body: { aircraftTypeIds: [t1, 999999] } }),
      { slug: ws.slug, id: String(b.body.id) },
    );
    expect(unknown.status).toBe(422);
    expect(unknown.body.error?.fields?.[0]?.path).toBe('aircraftTypeIds.1');
    // Nothing half-saved: T-1 did not join the fleet, T-2 did not leave it.
    expect(await db()('aircraft_types').where({ id: t1 }).first()).toMatchObject({ default_fleet_id: null });
    expect(await db()('aircraft_types').where({ id: t2 }).first()).toMatchObject({ default_fleet_id: b.body.id });
  });

  it('DELETE removes the fleet; its flights fall back to their type default', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const a = await call<FleetDto>(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie, body: { name: 'Default' } }),
      { slug: ws.slug },
    );
    const b = await call<FleetDto>(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie, body: { name: 'Charter' } }),
      { slug: ws.slug },
    );
    const t = await insertType(ws.id, 'T-9', a.body.id);
    const f = await insertFlight(ws.id, {
      date: '2026-10-01',
      flight: 'Y',
      typeId: t,
      code: 'T-9',
      fleetId: b.body.id,
      distanceKm: 1,
      fuelKg: 1,
      noxKg: 1,
      noxAboveKg: 0,
    });
    expect((await resolveFlightFleets({ workspaceId: ws.id }, [f])).get(f)).toBe(b.body.id);
    const del = await call(fleetRoute.DELETE, apiRequest('DELETE', path(ws.slug, b.body.id), { cookie }), {
      slug: ws.slug,
      id: String(b.body.id),
    });
    expect(del.status).toBe(204);
    expect((await resolveFlightFleets({ workspaceId: ws.id }, [f])).get(f)).toBe(a.body.id);
    expect(
      (
        await call(fleetRoute.GET, apiRequest('GET', path(ws.slug, b.body.id), { cookie }), {
          slug: ws.slug,
          id: String(b.body.id),
        })
      ).status,
    ).toBe(404);
  });

  it('401, 403 (planner and viewer cannot write), 404 (other workspace, unknown id), 422, 400, foreign origin', async () => {
    const ws = await makeWorkspace(['planner', 'viewer']);
    const other = await makeWorkspace();
    const owner = await sessionCookie(ws.owner.id);
    const f = await call<FleetDto>(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie: owner, body: { name: 'F' } }),
      { slug: ws.slug },
    );
    const p = { slug: ws.slug, id: String(f.body.id) };
    expect(
      (await call(fleetsRoute.POST, apiRequest('POST', path(ws.slug), { body: { name: 'X' } }), { slug: ws.slug }))
        .status,
    ).toBe(401);
    for (const role of ['planner', 'viewer'] as const) {
      const c = await sessionCookie(ws.members[role].id);
      expect(
        (
          await call(fleetsRoute.POST, apiRequest('POST', path(ws.slug), { cookie: c, body: { name: 'X' } }), {
            slug: ws.slug,
          })
        ).status,
      ).toBe(403);
      expect(
        (
          await call(
            fleetRoute.PATCH,
            apiRequest('PATCH', path(ws.slug, f.body.id), { cookie: c, body: { name: 'Y' } }),
            p,
          )
        ).status,
      ).toBe(403);
      expect(
        (await call(fleetRoute.DELETE, apiRequest('DELETE', path(ws.slug, f.body.id), { cookie: c }), p)).status,
      ).toBe(403);
      expect(
        (await call(fleetsRoute.GET, apiRequest('GET', path(ws.slug), { cookie: c }), { slug: ws.slug })).status,
      ).toBe(200);
    }
    const stranger = await sessionCookie(other.owner.id);
    expect(
      (await call(fleetRoute.GET, apiRequest('GET', path(ws.slug, f.body.id), { cookie: stranger }), p)).status,
    ).toBe(404);
    expect(
      (
        await call(fleetRoute.GET, apiRequest('GET', path(other.slug, f.body.id), { cookie: stranger }), {
          slug: other.slug,
          id: String(f.body.id),
        })
      ).status,
    ).toBe(404);
    expect(
      (await call(fleetRoute.GET, apiRequest('GET', path(ws.slug, 1), { cookie: owner }), { slug: ws.slug, id: 'abc' }))
        .status,
    ).toBe(404);
    const empty = await call(
      fleetsRoute.POST,
      apiRequest('POST', path(ws.slug), { cookie: owner, body: { name: '  ', description: 'x'.repeat(600) } }),
      { slug: ws.slug },
    );
    expect(empty.status).toBe(422);
    expect(empty.body.error?.fields?.map((x) => x.path).sort()).toEqual(['description', 'name']);
    const nothing = await call(
      fleetRoute.PATCH,
      apiRequest('PATCH', path(ws.slug, f.body.id), { cookie: owner, body: {} }),
      p,
    );
    expect(nothing.status).toBe(422);
    expect(
      (
        await call(
          fleetsRoute.POST,
          apiRequest('POST', path(ws.slug), {
            cookie: owner,
            rawBody: '{"name":',
            headers: { 'content-type': 'application/json' },
          }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(400);
    expect(
      (
        await call(
          fleetsRoute.POST,
          apiRequest('POST', path(ws.slug), { cookie: owner, origin: 'https://evil.example', body: { name: 'Z' } }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(403);
    expect(await db()('fleets').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
  });
});
