import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';

useTestDatabase();

const POINTS = [
  { lat: 60, lon: 0, flightLevel: 100, time: '2026-11-20T10:00:00Z' },
  { lat: 61, lon: -10, flightLevel: 370, time: '2026-11-20T10:40:00Z' },
  { lat: 62, lon: -20, flightLevel: 370, time: '2026-11-20T11:20:00Z' },
];
const BODY = { route: { track: { points: POINTS } }, fuelBurnKg: 9000, emission: { eiNoxGPerKg: 14 }, month: 1 };

describe('screenings API with a flown track', () => {
  it('save without a cruise: 201 with the track summary; the list labels it as a track', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<{
      result: { track: { points: number; durationS: number; levels: number[] }; cruiseTimeH: number };
    }>(screeningsRoute.POST, apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: BODY }), {
      slug: ws.slug,
    });
    expect(r.status).toBe(201);
    expect(r.body.result.track).toMatchObject({ points: 3, durationS: 4800, levels: [235, 370] });
    expect(r.body.result.cruiseTimeH).toBeCloseTo(80 / 60, 12);
    const list = await call<{ items: { routeLabel: string }[] }>(
      screeningsRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items[0].routeLabel).toBe('60.0,0.0 → 62.0,-20.0 (track, 3 points)');
  });

  it('a track with time running backwards is a 422 naming the point', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const points = [POINTS[0], { ...POINTS[1], time: '2026-11-20T09:00:00Z' }, POINTS[2]];
    const r = await call<{ error: { fields: { path: string }[] } }>(
      previewRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, {
        cookie,
        body: { ...BODY, route: { track: { points } } },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    expect(r.body.error.fields.map((f) => f.path)).toContain('route.track.points.1.time');
  });
});
