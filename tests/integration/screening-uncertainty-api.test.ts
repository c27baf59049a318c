import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import * as openapiRoute from '@/app/api/v1/openapi.json/route';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as exportRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/export/route';

useTestDatabase();

const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 50_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

type P = { p5: number; p50: number; p95: number };
type Preview = {
  result: {
    uncertainty?: {
      samples: number;
      seed: number;
      ozoneLossKg: P;
      noxAboveTropopauseKg: P;
      drivers: { ozoneLossKg: { input: string; share: number }[] };
    };
  };
  months?: { rows: { month: number; noxAboveTropopauseKg: number }[]; sameEveryMonth: boolean; note: string | null };
};

describe('preview with uncertainty and the month sweep', () => {
  it('adds percentiles and drivers when asked, the 12-month sweep with months: true; none otherwise', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const path = `/api/v1/workspaces/${ws.slug}/screenings/preview`;
    const r = await call<Preview>(
      previewRoute.POST,
      apiRequest('POST', path, { cookie, body: { ...FLIGHT, uncertainty: { samples: 200, seed: 9 }, months: true } }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(200);
    const u = r.body.result.uncertainty;
    expect(u?.samples).toBe(200);
    expect(u?.seed).toBe(9);
    expect(u!.ozoneLossKg.p5).toBeLessThanOrEqual(u!.ozoneLossKg.p95);
    expect(u!.drivers.ozoneLossKg.reduce((t, d) => t + d.share, 0)).toBeCloseTo(1, 9);
    expect(r.body.months?.rows.map((m) => m.month)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(r.body.months?.sameEveryMonth).toBe(false);

    const plain = await call<Preview>(previewRoute.POST, apiRequest('POST', path, { cookie, body: FLIGHT }), {
      slug: ws.slug,
    });
    expect(plain.body.result.uncertainty).toBeUndefined();
    expect(plain.body.months).toBeUndefined();

    const fixed = await call<Preview>(
      previewRoute.POST,
      apiRequest('POST', path, { cookie, body: { ...FLIGHT, tropopause: { altitudeM: 10_500 }, months: true } }),
      { slug: ws.slug },
    );
    expect(fixed.body.months?.sameEveryMonth).toBe(true);
    expect(fixed.body.months?.note).toMatch(/does not change with the month/);
  });

  it('422 names uncertainty.samples and months when they are bad', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const path = `/api/v1/workspaces/${ws.slug}/screenings/preview`;
    const bad = await call(
      previewRoute.POST,
      apiRequest('POST', path, { cookie, body: { ...FLIGHT, uncertainty: { samples: 10 }, months: 'yes' } }),
      { slug: ws.slug },
    );
    expect(bad.status).toBe(422);
    const paths = (bad.body.error?.fields ?? []).map((f: { path: string }) => f.path);
    expect(paths).toContain('uncertainty.samples');
    expect(paths).toContain('months');
  });

  it('the OpenAPI document shows the uncertainty input and the months option on the preview', async () => {
    const r = await call<{
      paths: Record<
        string,
        {
          post?: {
            requestBody: { content: { 'application/json': { schema: { properties: Record<string, unknown> } } } };
          };
        }
      >;
    }>(openapiRoute.GET, apiRequest('GET', '/api/v1/openapi.json'));
    const props =
      r.body.paths['/workspaces/{slug}/screenings/preview'].post!.requestBody.content['application/json'].schema
        .properties;
    expect(Object.keys(props)).toEqual(expect.arrayContaining(['uncertainty', 'months', 'whatIf']));
  });
});

type ExportGet = (req: Request, ctx: { params: Promise<{ slug: string; id: string }> }) => Promise<Response>;

describe('exports carry the percentiles', () => {
  it('CSV and JSON of a saved screening include p5/p50/p95, the ones it was saved with when it was sampled', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const saved = await call<{ id: number; result: { uncertainty?: { seed: number; ozoneLossKg: P } } }>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie,
        body: { ...FLIGHT, name: 'Sampled', uncertainty: { samples: 100, seed: 5 } },
      }),
      { slug: ws.slug },
    );
    expect(saved.status).toBe(201);
    expect(saved.body.result.uncertainty?.seed).toBe(5);
    const get = (q: string) =>
      (exportRoute.GET as unknown as ExportGet)(
        apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings/${saved.body.id}/export${q}`, { cookie }),
        {
          params: Promise.resolve({ slug: ws.slug, id: String(saved.body.id) }),
        },
      );
    const json = (await (await get('?format=json')).json()) as {
      result: { uncertainty: { seed: number; ozoneLossKg: P } };
    };
    expect(json.result.uncertainty.ozoneLossKg).toEqual(saved.body.result.uncertainty?.ozoneLossKg);
    const csv = await (await get('?format=csv')).text();
    expect(csv).toContain('Percentiles from,"100 samples, seed 5"');
    expect(csv).toMatch(/Ozone-loss figure \(kg O3\) 95th percentile,\d/);
    expect(csv).toMatch(/NOx above the tropopause \(kg NO2\) 5th percentile,\d/);

    // Saved without sampling: the export samples it now with the defaults (400 samples, seed 1).
    const plain = await call<{ id: number }>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: { ...FLIGHT, name: 'Plain' } }),
      { slug: ws.slug },
    );
    const csv2 = await (
      await (exportRoute.GET as unknown as ExportGet)(
        apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings/${plain.body.id}/export`, { cookie }),
        {
          params: Promise.resolve({ slug: ws.slug, id: String(plain.body.id) }),
        },
      )
    ).text();
    expect(csv2).toContain('Percentiles from,"400 samples, seed 1"');
  });
});
