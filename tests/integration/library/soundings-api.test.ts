import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { multipartRequest } from './multipart';
import * as soundingsRoute from '@/app/api/v1/workspaces/[slug]/soundings/route';
import * as soundingRoute from '@/app/api/v1/workspaces/[slug]/soundings/[id]/route';
import * as uploadRoute from '@/app/api/v1/workspaces/[slug]/soundings/upload/route';
import { db } from '@/db/client';
import { isa } from '@/lib/screening';

useTestDatabase();

type SoundingBody = {
  id: number;
  name: string;
  station: string;
  observedAt: string | null;
  levels: { altitudeM?: number; pressureHpa?: number; temperatureK: number }[];
  tropopause: { altitudeM: number; pressureHpa: number; temperatureK: number } | null;
};
type Problems = { problems: { line: number; column: string; message: string }[]; warnings: unknown[] };

/**
 * 6.5 K/km from 288.15 K at 0 m up to 11 km, isothermal above to 20 km (levels every km). By the
 * WMO (1957) definition the lowest level where the lapse rate falls to 2 K/km or less, and stays
 * so on average over the 2 km above, is 11 000 m.
 */
const ISA_LIKE = Array.from({ length: 21 }, (_, k) => ({
  altitudeM: k * 1000,
  temperatureK: k <= 11 ? 288.15 - 6.5 * k : 216.65,
}));

const base = (slug: string) => `/api/v1/workspaces/${slug}/soundings`;
const count = async (workspaceId: number) =>
  Number(((await db()('soundings').where({ workspace_id: workspaceId }).count({ n: '*' }).first()) as { n: number }).n);

describe('soundings API (JSON)', () => {
  it('201 stores the levels with the WMO tropopause at 11 km (WMO 1957 definition); GET lists and reads it', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<SoundingBody>(
      soundingsRoute.POST,
      apiRequest('POST', base(ws.slug), {
        cookie,
        body: { name: 'Constructed', station: 'Test', observedAt: '2026-11-20T12:00Z', levels: ISA_LIKE },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    expect(r.body.tropopause?.altitudeM).toBeCloseTo(11_000, 6);
    expect(r.body.tropopause?.temperatureK).toBeCloseTo(216.65, 6);
    expect(r.body.observedAt).toBe('2026-11-20T12:00:00.000Z');
    const row = await db()('soundings').where({ id: r.body.id }).first();
    expect(Number(row.tropopause_altitude_m)).toBeCloseTo(11_000, 6);
    const list = await call<{ items: SoundingBody[] }>(
      soundingsRoute.GET,
      apiRequest('GET', base(ws.slug), { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items.map((s) => s.id)).toEqual([r.body.id]);
    const one = await call<SoundingBody>(
      soundingRoute.GET,
      apiRequest('GET', `${base(ws.slug)}/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(one.body.levels).toHaveLength(21);
  });

  it('a sounding that keeps cooling at 6.5 K/km has no tropopause: stored as null', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const levels = Array.from({ length: 14 }, (_, k) => ({ altitudeM: k * 1000, temperatureK: 288.15 - 6.5 * k }));
    const r = await call<SoundingBody>(
      soundingsRoute.POST,
      apiRequest('POST', base(ws.slug), { cookie, body: { name: 'No break', levels } }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(201);
    expect(r.body.tropopause).toBeNull();
  });

  it('422 by path for bad levels, a bad time and a missing name; nothing saved', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const r = await call(
      soundingsRoute.POST,
      apiRequest('POST', base(ws.slug), {
        cookie,
        body: {
          name: '',
          observedAt: '2026-02-30',
          levels: [{ altitudeM: 0, temperatureK: 15 }, { altitudeM: 1000 }, { altitudeM: 1000, temperatureK: 280 }],
        },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    const paths = r.body.error?.fields?.map((f) => f.path) ?? [];
    expect(paths).toEqual(
      expect.arrayContaining(['name', 'observedAt', 'levels.0.temperatureK', 'levels.1.temperatureK']),
    );
    const few = await call(
      soundingsRoute.POST,
      apiRequest('POST', base(ws.slug), { cookie, body: { name: 'Few', levels: ISA_LIKE.slice(0, 2) } }),
      { slug: ws.slug },
    );
    expect(few.status).toBe(422);
    expect(few.body.error?.fields?.[0].path).toBe('levels');
    expect(await count(ws.id)).toBe(0);
  });

  it('401, 403 for a viewer writing or deleting, 404 across workspaces; DELETE 204', async () => {
    const ws = await makeWorkspace(['viewer']);
    const other = await makeWorkspace();
    expect((await call(soundingsRoute.GET, apiRequest('GET', base(ws.slug)), { slug: ws.slug })).status).toBe(401);
    const owner = await sessionCookie(ws.owner.id);
    const viewer = await sessionCookie(ws.members.viewer.id);
    const r = await call<SoundingBody>(
      soundingsRoute.POST,
      apiRequest('POST', base(ws.slug), { cookie: owner, body: { name: 'S', levels: ISA_LIKE } }),
      { slug: ws.slug },
    );
    const id = String(r.body.id);
    expect(
      (
        await call(
          soundingsRoute.POST,
          apiRequest('POST', base(ws.slug), { cookie: viewer, body: { name: 'V', levels: ISA_LIKE } }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await call(soundingRoute.DELETE, apiRequest('DELETE', `${base(ws.slug)}/${id}`, { cookie: viewer }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await call(soundingRoute.GET, apiRequest('GET', `${base(ws.slug)}/${id}`, { cookie: viewer }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(200);
    const stranger = await sessionCookie(other.owner.id);
    expect(
      (
        await call(soundingRoute.GET, apiRequest('GET', `${base(other.slug)}/${id}`, { cookie: stranger }), {
          slug: other.slug,
          id,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(soundingRoute.DELETE, apiRequest('DELETE', `${base(ws.slug)}/${id}`, { cookie: stranger }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(soundingRoute.GET, apiRequest('GET', `${base(ws.slug)}/9999`, { cookie: owner }), {
          slug: ws.slug,
          id: '9999',
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(soundingRoute.DELETE, apiRequest('DELETE', `${base(ws.slug)}/${id}`, { cookie: owner }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(204);
    expect(await count(ws.id)).toBe(0);
  });
});

describe('soundings CSV upload', () => {
  const upload = (slug: string, cookie: string, csv: string, fields: Record<string, string> = { name: 'Upload' }) =>
    call<SoundingBody & Problems>(uploadRoute.POST, multipartRequest(`${base(slug)}/upload`, { cookie, csv, fields }), {
      slug,
    });

  it('201 from temperature_c (converted to K) with pressure only; the tropopause is found', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    // ISA pressures at 0..20 km (ICAO Doc 7488/3, by the engine's isa()) with the constructed profile, in °C.
    const isaHpa = ISA_LIKE.map((l) => Number((isa(l.altitudeM).pressurePa / 100).toFixed(2)));
    const lines = isaHpa.map((p, k) => `${p},${(ISA_LIKE[k].temperatureK - 273.15).toFixed(2)}`);
    const r = await upload(ws.slug, cookie, `\uFEFFPressure_hPa,Temperature_C\n${lines.join('\n')}\n`, {
      name: 'Celsius',
      station: 'Test station',
      observedAt: '2026-11-20 00:00',
    });
    expect(r.status).toBe(201);
    expect(r.body.levels[0]).toEqual({ pressureHpa: 1013.25, temperatureK: 288.15 });
    expect(r.body.station).toBe('Test station');
    // Altitudes come from the hypsometric equation here, so the tropopause sits within a few metres of 11 km.
    expect(r.body.tropopause?.altitudeM).toBeGreaterThan(10_950);
    expect(r.body.tropopause?.altitudeM).toBeLessThan(11_050);
    // ICAO Doc 7488/3: 226.32 hPa at 11 000 m.
    expect(r.body.tropopause?.pressureHpa).toBeCloseTo(226.32, 1);
  });

  it('422 with problems by line and column (header = 1) and form-field errors; nothing saved', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const csv = [
      'altitude_m,temperature_k,notes',
      '0,288.15,a',
      '1000,abc,b',
      '2000,20,c',
      ',250,d',
      '1000,270,e',
    ].join('\n');
    const r = await upload(ws.slug, cookie, csv, { name: '', observedAt: 'yesterday' });
    expect(r.status).toBe(422);
    expect(r.body.problems.map((p) => `${p.line}:${p.column}`)).toEqual([
      '3:temperature_k',
      '4:temperature_k',
      '5:altitude_m',
      '6:altitude_m',
    ]);
    expect(r.body.warnings).toEqual([expect.objectContaining({ line: 1, column: 'notes' })]);
    expect(r.body.error?.fields?.map((f) => f.path).sort()).toEqual(['name', 'observedAt']);
    expect(await count(ws.id)).toBe(0);
  });

  it('levels whose pressures do not fall with altitude are refused on their line', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const r = await upload(
      ws.slug,
      cookie,
      'altitude_m,pressure_hpa,temperature_k\n0,1013,288\n1000,900,281\n2000,950,275\n',
    );
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual([expect.objectContaining({ line: 4, column: 'pressure_hpa' })]);
  });

  it('413 over the size limit, 400 without a file, 403 for a viewer', async () => {
    const ws = await makeWorkspace(['viewer']);
    const cookie = await sessionCookie(ws.owner.id);
    const big = `altitude_m,temperature_k\n${Array.from({ length: 60_000 }, (_, i) => `${i},250.000000`).join('\n')}`;
    expect((await upload(ws.slug, cookie, big)).status).toBe(413);
    const noFile = await call(
      uploadRoute.POST,
      multipartRequest(`${base(ws.slug)}/upload`, { cookie, csv: 'x', field: 'levels', fields: { name: 'x' } }),
      { slug: ws.slug },
    );
    expect(noFile.status).toBe(400);
    const viewer = await upload(
      ws.slug,
      await sessionCookie(ws.members.viewer.id),
      'altitude_m,temperature_k\n0,288\n1000,281\n2000,275\n',
    );
    expect(viewer.status).toBe(403);
    expect(await count(ws.id)).toBe(0);
  });
});
