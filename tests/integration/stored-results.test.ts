import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as screeningRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/route';
import * as rescreenRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/rescreen/route';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as importRoute from '@/app/api/v1/workspaces/[slug]/imports/[id]/route';
import * as importRescreenRoute from '@/app/api/v1/workspaces/[slug]/imports/[id]/rescreen/route';
import * as compareRoute from '@/app/api/v1/workspaces/[slug]/fleets/compare/route';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import { db, nowIso } from '@/db/client';
import { rebuildFlightRollups } from '@/db/flight-rollups';
import { ENGINE_VERSION } from '@/lib/screening';
import { runImportsToCompletion } from '@/lib/imports/worker';
import type { ImportDto } from '@/db/imports';
import type { FleetComparison } from '@/lib/fleets/types';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from './imports/support';

useTestDatabase();

/** An engine version older than any the code carries now; rows are written with it directly. */
const OLD = '2026.12.1';

const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KSFO' }] },
  cruise: { flightLevel: 390 },
  fuelBurnKg: 60_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

type Saved = {
  id: number;
  engineVersion: string;
  rescreenOf: number | null;
  result: { engineVersion: string; noxAboveTropopauseKg: number };
};
type Detail = Saved & {
  outdated: boolean;
  currentEngineVersion: string;
  rescreens: { id: number; engineVersion: string }[];
};
type Err = { error: { code: string; message: string; fields?: { path: string }[] } };

async function units(workspaceId: number): Promise<number> {
  const r = (await db()('usage_events').where({ workspace_id: workspaceId }).sum({ n: 'quantity' }).first()) as {
    n: number | null;
  };
  return Number(r.n ?? 0);
}

async function setBilling(workspaceId: number, status: string): Promise<void> {
  const row = await db()('workspace_billing').where({ workspace_id: workspaceId }).first();
  if (row) await db()('workspace_billing').where({ workspace_id: workspaceId }).update({ status });
  else
    await db()('workspace_billing').insert({
      workspace_id: workspaceId,
      plan_id: 'fleet',
      status,
      updated_at: nowIso(),
    });
}

describe('a saved screening made with an older engine version', () => {
  it('says so, and a re-screen is a new screening with the current version that adds no unit', async () => {
    expect(ENGINE_VERSION).not.toBe(OLD);
    const ws = await makeWorkspace(['planner', 'viewer']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const first = await call<Saved>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: FLIGHT }),
      { slug: ws.slug },
    );
    expect(first.status).toBe(201);
    const fresh = first.body.result.noxAboveTropopauseKg;
    // As if saved by an older engine: the version it was made with and a figure that engine gave.
    await db()('screenings').where({ id: first.body.id }).update({ engine_version: OLD, nox_above_kg: 1 });
    expect(await units(ws.id)).toBe(1);

    const path = `/api/v1/workspaces/${ws.slug}/screenings/${first.body.id}`;
    const before = await call<Detail>(screeningRoute.GET, apiRequest('GET', path, { cookie }), {
      slug: ws.slug,
      id: String(first.body.id),
    });
    expect(before.body).toMatchObject({
      engineVersion: OLD,
      currentEngineVersion: ENGINE_VERSION,
      outdated: true,
      rescreens: [],
    });

    const again = await call<Saved>(rescreenRoute.POST, apiRequest('POST', `${path}/rescreen`, { cookie }), {
      slug: ws.slug,
      id: String(first.body.id),
    });
    expect(again.status).toBe(201);
    expect(again.body.id).not.toBe(first.body.id);
    expect(again.body).toMatchObject({ engineVersion: ENGINE_VERSION, rescreenOf: first.body.id });
    expect(again.body.result.engineVersion).toBe(ENGINE_VERSION);
    expect(again.body.result.noxAboveTropopauseKg).toBeCloseTo(fresh, 9);
    // Not billed again: the ledger still holds the one unit of the first screening.
    expect(await units(ws.id)).toBe(1);
    // The old screening keeps its figures and version.
    expect(await db()('screenings').where({ id: first.body.id }).first()).toMatchObject({
      engine_version: OLD,
      nox_above_kg: 1,
    });

    const repeat = await call<Saved>(rescreenRoute.POST, apiRequest('POST', `${path}/rescreen`, { cookie }), {
      slug: ws.slug,
      id: String(first.body.id),
    });
    expect(repeat.status).toBe(200);
    expect(repeat.body.id).toBe(again.body.id);
    expect(
      Number(((await db()('screenings').where({ workspace_id: ws.id }).count({ n: '*' }).first()) as { n: number }).n),
    ).toBe(2);

    const after = await call<Detail>(screeningRoute.GET, apiRequest('GET', path, { cookie }), {
      slug: ws.slug,
      id: String(first.body.id),
    });
    expect(after.body.rescreens).toEqual([
      expect.objectContaining({ id: again.body.id, engineVersion: ENGINE_VERSION }),
    ]);

    const current = await call<Err>(
      rescreenRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/${again.body.id}/rescreen`, { cookie }),
      { slug: ws.slug, id: String(again.body.id) },
    );
    expect(current.status).toBe(409);
    expect(current.body.error.message).toContain(ENGINE_VERSION);

    const viewer = await call<Err>(
      rescreenRoute.POST,
      apiRequest('POST', `${path}/rescreen`, { cookie: await sessionCookie(ws.members.viewer.id) }),
      { slug: ws.slug, id: String(first.body.id) },
    );
    expect(viewer.status).toBe(403);
  });

  it('passes the billing gate while a new screening is refused, since nothing is billed', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const first = await call<Saved>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: FLIGHT }),
      { slug: ws.slug },
    );
    await db()('screenings').where({ id: first.body.id }).update({ engine_version: OLD });
    await setBilling(ws.id, 'past_due');
    const refused = await call<Err>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: FLIGHT }),
      { slug: ws.slug },
    );
    expect(refused.status).toBe(402);
    const again = await call<Saved>(
      rescreenRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/${first.body.id}/rescreen`, { cookie }),
      { slug: ws.slug, id: String(first.body.id) },
    );
    expect(again.status).toBe(201);
    expect(await units(ws.id)).toBe(1);
  });

  it('a saved input the current engine refuses comes back as 422 naming the field, not a 500', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const first = await call<Saved>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: FLIGHT }),
      { slug: ws.slug },
    );
    await db()('screenings')
      .where({ id: first.body.id })
      .update({ engine_version: OLD, input_json: JSON.stringify({ ...FLIGHT, fuelBurnKg: -5 }) });
    const r = await call<Err>(
      rescreenRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/${first.body.id}/rescreen`, { cookie }),
      { slug: ws.slug, id: String(first.body.id) },
    );
    expect(r.status).toBe(422);
    expect(r.body.error.fields?.map((f) => f.path)).toContain('fuelBurnKg');
  });
});

describe("re-screening an import's flights", () => {
  it('runs in the background with progress, restores current figures and adds no units', async () => {
    const ws = await makeWorkspace(['analyst', 'viewer']);
    await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const up = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(12)), { cookie }),
      { slug: ws.slug },
    );
    expect(up.status).toBe(202);
    const early = await call<Err>(
      importRescreenRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/imports/${up.body.id}/rescreen`, { cookie }),
      { slug: ws.slug, id: String(up.body.id) },
    );
    expect(early.status).toBe(409);
    await runImportsToCompletion({ chunkSize: 5 });
    expect(await units(ws.id)).toBe(12);
    const truth = new Map(
      (
        (await db()('flights').where({ import_id: up.body.id }).select('id', 'nox_above_kg')) as {
          id: number;
          nox_above_kg: number;
        }[]
      ).map((f) => [Number(f.id), Number(f.nox_above_kg)]),
    );

    const ids = [...truth.keys()].sort((a, b) => a - b);
    const stale = ids.slice(0, 7);
    await db()('flights').whereIn('id', stale).update({ engine_version: OLD, nox_above_kg: 0 });
    await rebuildFlightRollups(db(), ws.id);

    const path = `/api/v1/workspaces/${ws.slug}/imports/${up.body.id}`;
    const before = await call<ImportDto>(importRoute.GET, apiRequest('GET', path, { cookie }), {
      slug: ws.slug,
      id: String(up.body.id),
    });
    expect(before.body.engineVersions).toEqual([
      { engineVersion: OLD, flights: 7 },
      { engineVersion: ENGINE_VERSION, flights: 5 },
    ]);

    const q = await call<ImportDto>(importRescreenRoute.POST, apiRequest('POST', `${path}/rescreen`, { cookie }), {
      slug: ws.slug,
      id: String(up.body.id),
    });
    expect(q.status).toBe(202);
    expect(q.body.rescreen).toMatchObject({ status: 'queued', engineVersion: ENGINE_VERSION, rows: 7, rowsDone: 0 });
    const twice = await call<ImportDto>(importRescreenRoute.POST, apiRequest('POST', `${path}/rescreen`, { cookie }), {
      slug: ws.slug,
      id: String(up.body.id),
    });
    expect(twice.status).toBe(202);
    expect(twice.body.rescreen?.requestedAt).toBe(q.body.rescreen?.requestedAt);

    const progress: number[] = [];
    await runImportsToCompletion({
      chunkSize: 3,
      onChunk: async () => {
        const mid = await call<ImportDto>(importRoute.GET, apiRequest('GET', path, { cookie }), {
          slug: ws.slug,
          id: String(up.body.id),
        });
        progress.push(mid.body.rescreen?.rowsDone ?? -1);
      },
    });
    expect(progress).toEqual([3, 6, 7]);

    const done = await call<ImportDto>(importRoute.GET, apiRequest('GET', path, { cookie }), {
      slug: ws.slug,
      id: String(up.body.id),
    });
    expect(done.body.rescreen).toMatchObject({ status: 'complete', rows: 7, rowsDone: 7, rowsFailed: 0 });
    expect(done.body.engineVersions).toEqual([{ engineVersion: ENGINE_VERSION, flights: 12 }]);
    for (const f of (await db()('flights')
      .where({ import_id: up.body.id })
      .select('id', 'nox_above_kg', 'engine_version')) as {
      id: number;
      nox_above_kg: number;
      engine_version: string;
    }[]) {
      expect(f.engine_version).toBe(ENGINE_VERSION);
      expect(Number(f.nox_above_kg)).toBeCloseTo(truth.get(Number(f.id)) ?? Number.NaN, 9);
    }
    expect(await units(ws.id)).toBe(12);

    const nothing = await call<Err>(importRescreenRoute.POST, apiRequest('POST', `${path}/rescreen`, { cookie }), {
      slug: ws.slug,
      id: String(up.body.id),
    });
    expect(nothing.status).toBe(409);
    const viewer = await call<Err>(
      importRescreenRoute.POST,
      apiRequest('POST', `${path}/rescreen`, { cookie: await sessionCookie(ws.members.viewer.id) }),
      { slug: ws.slug, id: String(up.body.id) },
    );
    expect(viewer.status).toBe(403);
  });
});

describe('comparisons and reports name their engine versions', () => {
  it('lists the versions with flight counts and warns when they are mixed', async () => {
    const ws = await makeWorkspace(['analyst']);
    const lib = await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const up = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(6)), { cookie }),
      { slug: ws.slug },
    );
    await runImportsToCompletion();
    const compare = () =>
      call<FleetComparison>(
        compareRoute.GET,
        apiRequest('GET', `/api/v1/workspaces/${ws.slug}/fleets/compare?from=2026-11-01&to=2026-11-30`, { cookie }),
        { slug: ws.slug },
      );

    const one = await compare();
    expect(one.body.engineVersions).toEqual([{ engineVersion: ENGINE_VERSION, flights: 6 }]);
    expect(one.body.mixedEngineVersions).toBe(false);
    expect(one.body.cautions.join(' ')).not.toMatch(/mix engine versions/);

    const ids = (
      (await db()('flights').where({ import_id: up.body.id }).orderBy('id').select('id')) as { id: number }[]
    ).map((f) => f.id);
    await db()('flights').whereIn('id', ids.slice(0, 2)).update({ engine_version: OLD });
    await rebuildFlightRollups(db(), ws.id);
    const mixed = await compare();
    expect(mixed.body.engineVersions).toEqual([
      { engineVersion: OLD, flights: 2 },
      { engineVersion: ENGINE_VERSION, flights: 4 },
    ]);
    expect(mixed.body.mixedEngineVersions).toBe(true);
    expect(mixed.body.cautions[0]).toContain(`${OLD} (2 flights)`);
    expect(mixed.body.cautions[0]).toContain(`${ENGINE_VERSION} (4 flights)`);

    const report = await call<{
      summary: {
        engineVersions: string[];
        engineVersionFlights: { engineVersion: string; flights: number }[];
        cautions: string[];
      };
    }>(
      reportsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports`, {
        cookie,
        body: { fleetIds: [lib.longHaulFleetId], from: '2026-11-01', to: '2026-11-30' },
      }),
      { slug: ws.slug },
    );
    expect(report.status).toBe(201);
    expect(report.body.summary.engineVersions).toEqual([OLD, ENGINE_VERSION]);
    expect(report.body.summary.engineVersionFlights).toEqual(mixed.body.engineVersions);
    expect(report.body.summary.cautions.some((c) => c.includes('mix engine versions'))).toBe(true);
  });
});
