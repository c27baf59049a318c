import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { multipartRequest } from './multipart';
import * as enginesRoute from '@/app/api/v1/workspaces/[slug]/engines/route';
import * as engineRoute from '@/app/api/v1/workspaces/[slug]/engines/[id]/route';
import * as importRoute from '@/app/api/v1/workspaces/[slug]/engines/import/route';
import * as typesRoute from '@/app/api/v1/workspaces/[slug]/aircraft-types/route';
import * as typeRoute from '@/app/api/v1/workspaces/[slug]/aircraft-types/[id]/route';
import { db, insertId } from '@/db/client';
import { engineCsvTemplate } from '@/lib/imports/engines-csv';

useTestDatabase();

type EngineBody = {
  id: number;
  name: string;
  fuelFlowKgS: number[];
  eiNoxGPerKg: number[];
  source: string;
  isDemo: boolean;
};
type TypeBody = {
  id: number;
  code: string;
  engineId: number | null;
  engineName: string | null;
  directEiGPerKg: number | null;
  defaultFleetId: number | null;
  defaultFleetName: string | null;
};
type Problems = {
  problems: { line: number; column: string; message: string }[];
  warnings: { line: number; column: string; message: string }[];
};

const ENGINE = {
  name: 'Test turbofan',
  fuelFlowKgS: [0.1, 0.3, 0.9, 1.1],
  eiNoxGPerKg: [4.5, 10.2, 22.8, 30.5],
  source: 'Invented for the test',
};
const count = async (table: string, workspaceId: number) =>
  Number(((await db()(table).where({ workspace_id: workspaceId }).count({ n: '*' }).first()) as { n: number }).n);

const engines = (slug: string) => `/api/v1/workspaces/${slug}/engines`;
const types = (slug: string) => `/api/v1/workspaces/${slug}/aircraft-types`;
const postEngine = (slug: string, cookie: string, body: unknown) =>
  call<EngineBody>(enginesRoute.POST, apiRequest('POST', engines(slug), { cookie, body }), { slug });
const postType = (slug: string, cookie: string, body: unknown) =>
  call<TypeBody>(typesRoute.POST, apiRequest('POST', types(slug), { cookie, body }), { slug });

describe('engines API', () => {
  it('201 adds an engine (not demo data); GET lists and reads it', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await postEngine(ws.slug, cookie, ENGINE);
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ ...ENGINE, isDemo: false });
    const list = await call<{ items: EngineBody[] }>(
      enginesRoute.GET,
      apiRequest('GET', engines(ws.slug), { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items.map((e) => e.name)).toEqual(['Test turbofan']);
    const one = await call<EngineBody>(
      engineRoute.GET,
      apiRequest('GET', `${engines(ws.slug)}/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(one.body.fuelFlowKgS).toEqual(ENGINE.fuelFlowKgS);
  });

  it('422 names the mode whose fuel flow does not rise, EI out of 0-200 g/kg, and a missing name', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const r = await postEngine(ws.slug, cookie, {
      name: '',
      fuelFlowKgS: [0.1, 0.9, 0.3, 1.1],
      eiNoxGPerKg: [0, 10, 250, 30],
    });
    expect(r.status).toBe(422);
    const byPath = Object.fromEntries((r.body.error?.fields ?? []).map((f) => [f.path, f.message]));
    expect(Object.keys(byPath).sort()).toEqual(['eiNoxGPerKg.0', 'eiNoxGPerKg.2', 'fuelFlowKgS.2', 'name'].sort());
    expect(byPath['fuelFlowKgS.2']).toMatch(/climb-out fuel flow must be higher than the approach/);
    expect(await count('engines', ws.id)).toBe(0);
    const three = await postEngine(ws.slug, cookie, { ...ENGINE, fuelFlowKgS: [0.1, 0.3, 0.9] });
    expect(three.status).toBe(422);
    expect(three.body.error?.fields?.[0].path).toMatch(/^fuelFlowKgS/);
  });

  it('401 signed out, 403 viewer, 404 another workspace and unknown id', async () => {
    const ws = await makeWorkspace(['viewer']);
    const other = await makeWorkspace();
    expect((await call(enginesRoute.GET, apiRequest('GET', engines(ws.slug)), { slug: ws.slug })).status).toBe(401);
    const viewer = await sessionCookie(ws.members.viewer.id);
    expect((await postEngine(ws.slug, viewer, ENGINE)).status).toBe(403);
    expect(
      (await call(enginesRoute.GET, apiRequest('GET', engines(ws.slug), { cookie: viewer }), { slug: ws.slug })).status,
    ).toBe(200);
    const theirs = await postEngine(other.slug, await sessionCookie(other.owner.id), ENGINE);
    const owner = await sessionCookie(ws.owner.id);
    expect(
      (await call(enginesRoute.GET, apiRequest('GET', engines(other.slug), { cookie: owner }), { slug: other.slug }))
        .status,
    ).toBe(404);
    const id = String(theirs.body.id);
    expect(
      (
        await call(engineRoute.GET, apiRequest('GET', `${engines(ws.slug)}/${id}`, { cookie: owner }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(engineRoute.DELETE, apiRequest('DELETE', `${engines(ws.slug)}/${id}`, { cookie: owner }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(
          engineRoute.PATCH,
          apiRequest('PATCH', `${engines(ws.slug)}/${id}`, { cookie: owner, body: { name: 'x' } }),
          { slug: ws.slug, id },
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await call(engineRoute.GET, apiRequest('GET', `${engines(ws.slug)}/424242`, { cookie: owner }), {
          slug: ws.slug,
          id: '424242',
        })
      ).status,
    ).toBe(404);
    const viewerDelete = await call(
      engineRoute.DELETE,
      apiRequest('DELETE', `${engines(ws.slug)}/1`, { cookie: viewer }),
      { slug: ws.slug, id: '1' },
    );
    expect(viewerDelete.status).toBe(403);
  });

  it('409 for a duplicate name; PATCH changes only what is sent and clears the demo mark', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const a = await postEngine(ws.slug, cookie, ENGINE);
    const dup = await postEngine(ws.slug, cookie, { ...ENGINE, name: 'TEST TURBOFAN' });
    expect(dup.status).toBe(409);
    expect(dup.body.error?.fields?.[0].path).toBe('name');
    await db()('engines').where({ id: a.body.id }).update({ is_demo: true });
    const id = String(a.body.id);
    const p = await call<EngineBody>(
      engineRoute.PATCH,
      apiRequest('PATCH', `${engines(ws.slug)}/${id}`, { cookie, body: { eiNoxGPerKg: [5, 11, 24, 32] } }),
      { slug: ws.slug, id },
    );
    expect(p.status).toBe(200);
    expect(p.body).toMatchObject({
      name: ENGINE.name,
      fuelFlowKgS: ENGINE.fuelFlowKgS,
      eiNoxGPerKg: [5, 11, 24, 32],
      isDemo: false,
    });
    const bad = await call(
      engineRoute.PATCH,
      apiRequest('PATCH', `${engines(ws.slug)}/${id}`, { cookie, body: { fuelFlowKgS: [1, 0.5, 2, 3] } }),
      { slug: ws.slug, id },
    );
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.[0].path).toBe('fuelFlowKgS.1');
  });

  it('deleting an engine an aircraft type uses is 409 naming the type; once the type is gone, 204', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const e = await postEngine(ws.slug, cookie, ENGINE);
    const t = await postType(ws.slug, cookie, {
      code: 'tt-1',
      engineId: e.body.id,
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 370,
    });
    expect(t.status).toBe(201);
    const id = String(e.body.id);
    const blocked = await call(engineRoute.DELETE, apiRequest('DELETE', `${engines(ws.slug)}/${id}`, { cookie }), {
      slug: ws.slug,
      id,
    });
    expect(blocked.status).toBe(409);
    expect(blocked.body.error?.message).toContain('TT-1');
    expect(await count('engines', ws.id)).toBe(1);
    expect(
      (
        await call(typeRoute.DELETE, apiRequest('DELETE', `${types(ws.slug)}/${t.body.id}`, { cookie }), {
          slug: ws.slug,
          id: String(t.body.id),
        })
      ).status,
    ).toBe(204);
    expect(
      (
        await call(engineRoute.DELETE, apiRequest('DELETE', `${engines(ws.slug)}/${id}`, { cookie }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(204);
    expect(await count('engines', ws.id)).toBe(0);
  });
});

describe('engines CSV import', () => {
  const HEADER =
    'name,idle_ff_kg_s,approach_ff_kg_s,climb_out_ff_kg_s,take_off_ff_kg_s,idle_ei,approach_ei,climb_out_ei,take_off_ei,source';
  const upload = (slug: string, cookie: string, csv: string | Uint8Array<ArrayBuffer>) =>
    call<Problems & { items: EngineBody[] }>(
      importRoute.POST,
      multipartRequest(`${engines(slug)}/import`, { cookie, csv, fileName: 'engines.csv' }),
      { slug },
    );

  it('201 imports every row, with a BOM, upper-case headers and an unknown column reported', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const csv = `\uFEFF${HEADER.toUpperCase()},Remarks\r\nEngine A,0.1,0.3,0.9,1.1,4,10,22,30,sheet 1,ok\r\n"Engine, B",0.2,0.6,1.8,2.2,5,12,26,36,,fine\r\n`;
    const r = await upload(ws.slug, cookie, csv);
    expect(r.status).toBe(201);
    expect(r.body.items.map((e) => e.name)).toEqual(['Engine A', 'Engine, B']);
    expect(r.body.items[1].fuelFlowKgS).toEqual([0.2, 0.6, 1.8, 2.2]);
    expect(r.body.warnings).toEqual([expect.objectContaining({ line: 1, column: 'remarks' })]);
    expect(await count('engines', ws.id)).toBe(2);
  });

  it('422 lists problems by line (header = 1) and column, and saves nothing: all or nothing', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    await postEngine(ws.slug, cookie, { ...ENGINE, name: 'Already here' });
    const csv = [
      HEADER,
      'Good one,0.1,0.3,0.9,1.1,4,10,22,30,',
      'Backwards,0.1,0.9,0.3,1.1,4,10,22,30,',
      'Wordy,0.1,0.3,abc,1.1,4,10,22,30,',
      'Already here,0.1,0.3,0.9,1.1,4,10,22,30,',
      'Good one,0.1,0.3,0.9,1.1,4,10,22,300,',
      'Short,0.1,0.3',
    ].join('\n');
    const r = await upload(ws.slug, cookie, csv);
    expect(r.status).toBe(422);
    expect(r.body.error?.code).toBe('invalid_fields');
    const where = r.body.problems.map((p) => `${p.line}:${p.column}`);
    expect(where).toEqual(['3:climb_out_ff_kg_s', '4:climb_out_ff_kg_s', '5:name', '6:take_off_ei', '7:']);
    expect(r.body.problems[2].message).toContain('already in this workspace');
    expect(await count('engines', ws.id)).toBe(1);
  });

  it('a name repeated within the file is a problem on the second line', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const r = await upload(
      ws.slug,
      cookie,
      `${HEADER}\nTwin,0.1,0.3,0.9,1.1,4,10,22,30,\ntwin,0.1,0.3,0.9,1.1,4,10,22,30,\n`,
    );
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual([{ line: 3, column: 'name', message: expect.stringContaining('line 2') }]);
  });

  it('a missing column is a problem on line 1; the template imports cleanly', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const missing = await upload(ws.slug, cookie, 'name,idle_ff_kg_s\nX,0.1\n');
    expect(missing.status).toBe(422);
    expect(missing.body.problems.every((p) => p.line === 1)).toBe(true);
    expect(missing.body.problems.map((p) => p.column)).toContain('take_off_ei');
    const template = await call(importRoute.GET, apiRequest('GET', `${engines(ws.slug)}/import`, { cookie }), {
      slug: ws.slug,
    });
    expect(template.status).toBe(200);
    expect(template.headers.get('content-type')).toContain('text/csv');
    expect(String(template.body)).toBe(engineCsvTemplate());
    const imported = await upload(ws.slug, cookie, engineCsvTemplate());
    expect(imported.status).toBe(201);
  });

  it('413 for a file over the limit; 400 for no file; 422 on the file field for a non-UTF-8 file (as a schedule import answers); 403 for a viewer', async () => {
    const ws = await makeWorkspace(['viewer']);
    const cookie = await sessionCookie(ws.owner.id);
    const big = `${HEADER}\n${'Engine,0.1,0.3,0.9,1.1,4,10,22,30,'.padEnd(200, 'x')}\n`.repeat(3000);
    const tooBig = await upload(ws.slug, cookie, big);
    expect(tooBig.status).toBe(413);
    const latin1 = new Uint8Array([
      ...new TextEncoder().encode(`${HEADER}\nMot`),
      0xe9,
      ...new TextEncoder().encode('ur,0.1,0.3,0.9,1.1,4,10,22,30,\n'),
    ]);
    const notUtf8 = await upload(ws.slug, cookie, latin1);
    expect(notUtf8.status).toBe(422);
    expect(notUtf8.body.error?.message).toContain('UTF-8');
    expect(notUtf8.body.error?.fields?.[0]?.path).toBe('file');
    const noFile = await call(
      importRoute.POST,
      multipartRequest(`${engines(ws.slug)}/import`, { cookie, csv: 'x', field: 'other' }),
      { slug: ws.slug },
    );
    expect(noFile.status).toBe(400);
    const json = await call(
      importRoute.POST,
      apiRequest('POST', `${engines(ws.slug)}/import`, { cookie, body: { file: 'x' } }),
      { slug: ws.slug },
    );
    expect(json.status).toBe(400);
    const viewer = await upload(ws.slug, await sessionCookie(ws.members.viewer.id), engineCsvTemplate());
    expect(viewer.status).toBe(403);
    expect(await count('engines', ws.id)).toBe(0);
  });
});

describe('aircraft types API', () => {
  it('201 with an engine and a default fleet (names joined); a direct-EI type needs no engine', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const e = await postEngine(ws.slug, cookie, ENGINE);
    const fleetId = await insertId(
      db()('fleets')
        .insert({ workspace_id: ws.id, name: 'Long-haul', created_at: new Date().toISOString() })
        .returning('id'),
    );
    const t = await postType(ws.slug, cookie, {
      code: 'lr-9',
      name: 'Long-range',
      engineId: e.body.id,
      engineCount: 2,
      typicalMach: 0.84,
      typicalFlightLevel: 390,
      defaultFleetId: Number(fleetId),
    });
    expect(t.status).toBe(201);
    expect(t.body).toMatchObject({
      code: 'LR-9',
      engineName: 'Test turbofan',
      defaultFleetName: 'Long-haul',
      directEiGPerKg: null,
    });
    const sst = await postType(ws.slug, cookie, {
      code: 'SST-1',
      directEiGPerKg: 11.5,
      engineCount: 4,
      typicalMach: 1.7,
      typicalFlightLevel: 580,
    });
    expect(sst.status).toBe(201);
    expect(sst.body).toMatchObject({ engineId: null, directEiGPerKg: 11.5 });
    const list = await call<{ items: TypeBody[] }>(typesRoute.GET, apiRequest('GET', types(ws.slug), { cookie }), {
      slug: ws.slug,
    });
    expect(list.body.items.map((i) => i.code)).toEqual(['LR-9', 'SST-1']);
  });

  it('422 by field: neither engine nor EI, both, counts and levels out of range, an engine or fleet of another workspace', async () => {
    const ws = await makeWorkspace();
    const other = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const neither = await postType(ws.slug, cookie, {
      code: 'A1',
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 350,
    });
    expect(neither.status).toBe(422);
    expect(neither.body.error?.fields?.map((f) => f.path)).toEqual(['engineId']);
    const mine = await postEngine(ws.slug, cookie, ENGINE);
    const both = await postType(ws.slug, cookie, {
      code: 'A1',
      engineId: mine.body.id,
      directEiGPerKg: 12,
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 350,
    });
    expect(both.body.error?.fields?.map((f) => f.path)).toEqual(['directEiGPerKg']);
    const ranges = await postType(ws.slug, cookie, {
      code: 'a b',
      directEiGPerKg: 250,
      engineCount: 9,
      typicalMach: 0,
      typicalFlightLevel: 355.5,
    });
    expect(ranges.body.error?.fields?.map((f) => f.path).sort()).toEqual([
      'code',
      'directEiGPerKg',
      'engineCount',
      'typicalFlightLevel',
      'typicalMach',
    ]);
    const theirs = await postEngine(other.slug, await sessionCookie(other.owner.id), ENGINE);
    const theirFleet = await insertId(
      db()('fleets')
        .insert({ workspace_id: other.id, name: 'Theirs', created_at: new Date().toISOString() })
        .returning('id'),
    );
    const foreign = await postType(ws.slug, cookie, {
      code: 'A1',
      engineId: theirs.body.id,
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 350,
      defaultFleetId: Number(theirFleet),
    });
    expect(foreign.status).toBe(422);
    expect(foreign.body.error?.fields?.map((f) => f.path)).toEqual(['engineId', 'defaultFleetId']);
    expect(await count('aircraft_types', ws.id)).toBe(0);
  });

  it('409 for a code already used (any case); PATCH switches a type from engine to direct EI; 404 across workspaces', async () => {
    const ws = await makeWorkspace(['viewer']);
    const other = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const e = await postEngine(ws.slug, cookie, ENGINE);
    const t = await postType(ws.slug, cookie, {
      code: 'XY-1',
      engineId: e.body.id,
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 350,
    });
    const dup = await postType(ws.slug, cookie, {
      code: 'xy-1',
      directEiGPerKg: 12,
      engineCount: 2,
      typicalMach: 0.8,
      typicalFlightLevel: 350,
    });
    expect(dup.status).toBe(409);
    expect(dup.body.error?.fields?.[0].path).toBe('code');
    const id = String(t.body.id);
    const p = await call<TypeBody>(
      typeRoute.PATCH,
      apiRequest('PATCH', `${types(ws.slug)}/${id}`, { cookie, body: { engineId: null, directEiGPerKg: 13 } }),
      { slug: ws.slug, id },
    );
    expect(p.status).toBe(200);
    expect(p.body).toMatchObject({ code: 'XY-1', engineId: null, directEiGPerKg: 13 });
    const viewer = await sessionCookie(ws.members.viewer.id);
    expect(
      (
        await call(
          typeRoute.PATCH,
          apiRequest('PATCH', `${types(ws.slug)}/${id}`, { cookie: viewer, body: { name: 'x' } }),
          { slug: ws.slug, id },
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await call(typeRoute.GET, apiRequest('GET', `${types(ws.slug)}/${id}`, { cookie: viewer }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(200);
    const stranger = await sessionCookie(other.owner.id);
    expect(
      (
        await call(typeRoute.GET, apiRequest('GET', `${types(other.slug)}/${id}`, { cookie: stranger }), {
          slug: other.slug,
          id,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(typeRoute.GET, apiRequest('GET', `${types(ws.slug)}/${id}`, { cookie: stranger }), {
          slug: ws.slug,
          id,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(typeRoute.GET, apiRequest('GET', `${types(ws.slug)}/77777`, { cookie }), {
          slug: ws.slug,
          id: '77777',
        })
      ).status,
    ).toBe(404);
  });

  it('a type added here is what a screening uses: its engine supplies the emission', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const e = await postEngine(ws.slug, cookie, ENGINE);
    await postType(ws.slug, cookie, {
      code: 'SCR-1',
      engineId: e.body.id,
      engineCount: 2,
      typicalMach: 0.82,
      typicalFlightLevel: 370,
    });
    const { getAircraftForScreening } = await import('@/db/aircraft-lookup');
    const found = await getAircraftForScreening({ workspaceId: ws.id }, 'scr-1');
    expect(found?.emission).toMatchObject({
      engine: { fuelFlowKgS: ENGINE.fuelFlowKgS, eiNoxGPerKg: ENGINE.eiNoxGPerKg },
      engineCount: 2,
      mach: 0.82,
    });
  });
});
