import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import { routeDistanceKm } from '@/lib/screening';

useTestDatabase();

const route = { waypoints: [{ airport: 'EGLL' }, { airport: 'BIKF' }, { airport: 'PANC' }] };
const base = { route, fuelBurnKg: 60_000, emission: { eiNoxGPerKg: 14 }, month: 1 };

type Result = {
  input: { cruise: { steps: { fromKm: number; flightLevel: number }[] } };
  result: { noxAboveTropopauseKg: number; segments: unknown[] };
};
type Problem = { error: { fields: { path: string; message: string }[] } };

describe('step climbs at a waypoint', () => {
  it('a step at waypoint 1 is the same screening as a step at the distance to that waypoint, and is saved as that distance', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const toKeflavik = routeDistanceKm([{ airport: 'EGLL' }, { airport: 'BIKF' }]);
    const preview = (body: unknown) =>
      call<Result>(
        previewRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, { cookie, body }),
        { slug: ws.slug },
      );
    const atWaypoint = await preview({
      ...base,
      cruise: {
        steps: [
          { fromKm: 0, flightLevel: 350 },
          { atWaypoint: 1, flightLevel: 390 },
        ],
      },
    });
    const atDistance = await preview({
      ...base,
      cruise: {
        steps: [
          { fromKm: 0, flightLevel: 350 },
          { fromKm: Math.round(toKeflavik * 1000) / 1000, flightLevel: 390 },
        ],
      },
    });
    expect(atWaypoint.status).toBe(200);
    expect(atWaypoint.body.input.cruise.steps[1].fromKm).toBeCloseTo(toKeflavik, 2);
    expect(atWaypoint.body.result.noxAboveTropopauseKg).toBe(atDistance.body.result.noxAboveTropopauseKg);
    const saved = await call<Result>(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie,
        body: {
          ...base,
          cruise: {
            steps: [
              { fromKm: 0, flightLevel: 350 },
              { atWaypoint: 1, flightLevel: 390 },
            ],
          },
        },
      }),
      { slug: ws.slug },
    );
    expect(saved.status).toBe(201);
    expect(saved.body.input.cruise.steps[1]).toEqual({
      fromKm: expect.closeTo(toKeflavik, 2) as unknown as number,
      flightLevel: 390,
    });
  });

  it.each([
    [0, 'from 1 to 2'],
    [3, 'from 1 to 2'],
    [1.5, 'from 1 to 2'],
  ])('atWaypoint %s is refused with the field named', async (at, message) => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    const r = await call<Problem>(
      previewRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings/preview`, {
        cookie,
        body: {
          ...base,
          cruise: {
            steps: [
              { fromKm: 0, flightLevel: 350 },
              { atWaypoint: at, flightLevel: 390 },
            ],
          },
        },
      }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(422);
    expect(r.body.error.fields.find((f) => f.path === 'cruise.steps.1.atWaypoint')?.message).toContain(message);
  });
});
