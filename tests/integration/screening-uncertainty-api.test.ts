import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import * as openapiRoute from '@/app/api/v1/openapi.json/route';

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
  result: { uncertainty?: { samples: number; seed: number; ozoneLossKg: P; noxAboveTropopauseKg: P; drivers: { ozoneLossKg: { input: string; share: number }[] } } };
  months?: { rows: { month: number; noxAboveTropopauseKg: number }[]; sameEveryMonth: boolean; note: string | null };
};

describe('preview with uncertainty and the month sweep', () => {
  it('adds percentiles and drivers when asked, the 12-month sweep with months: true; none otherwise', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const path = `/api/v1/workspaces/${ws.slug}/screenings/preview`;
    const r = await call<Preview>(previewRoute.POST, apiRequest('POST', path, { cookie, body: { ...FLIGHT, uncertainty: { samples: 200, seed: 9 }, months: true } }), { slug: ws.slug });
    expect(r.status).toBe(200);
    const u = r.body.result.uncertainty;
    expect(u?.samples).toBe(200);
    expect(u?.seed).toBe(9);
    expect(u!.ozoneLossKg.p5).toBeLessThanOrEqual(u!.ozoneLossKg.p95);
    expect(u!.drivers.ozoneLossKg.reduce((t, d) => t + d.share, 0)).toBeCloseTo(1, 9);
    expect(r.body.months?.rows.map((m) => m.month)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(r.body.months?.sameEveryMonth).toBe(false);

    const plain = await call<Preview>(previewRoute.POST, apiRequest('POST', path, { cookie, body: FLIGHT }), { slug: ws.slug });
    expect(plain.body.result.uncertainty).toBeUndefined();
    expect(plain.body.months).toBeUndefined();

    const fixed = await call<Preview>(previewRoute.POST, apiRequest('POST', path, { cookie, body: { ...FLIGHT, tropopause: { altitudeM: 10_500 }, months: true } }), { slug: ws.slug });
    expect(fixed.body.months?.sameEveryMonth).toBe(true);
    expect(fixed.body.months?.note).toMatch(/does not change with the month/);
  });

  it('422 names uncertainty.samples and months when they are bad', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const path = `/api/v1/workspaces/${ws.slug}/screenings/preview`;
    const bad = await call(previewRoute.POST, apiRequest('POST', path, { cookie, body: { ...FLIGHT, uncertainty: { samples: 10 }, months: 'yes' } }), { slug: ws.slug });
    expect(bad.status).toBe(422);
    const paths = (bad.body.error?.fields ?? []).map((f: { path: string }) => f.path);
    expect(paths).toContain('uncertainty.samples');
    expect(paths).toContain('months');
  });

  it('the OpenAPI document shows the uncertainty input and the months option on the preview', async () => {
    const r = await call<{ paths: Record<string, { post?: { requestBody: { content: { 'application/json': { schema: { properties: Record<string, unknown> } } } } } }> }>(
      openapiRoute.GET,
      apiRequest('GET', '/api/v1/openapi.json'),
    );
    const props = r.body.paths['/workspaces/{slug}/screenings/preview'].post!.requestBody.content['application/json'].schema.properties;
    expect(Object.keys(props)).toEqual(expect.arrayContaining(['uncertainty', 'months', 'whatIf']));
  });
});
