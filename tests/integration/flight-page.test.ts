import { beforeEach, describe, expect, it, vi } from 'vitest';
import { TEST_ORIGIN, apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import { resetScope } from '../support/request-scope';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as tracksRoute from '@/app/api/v1/workspaces/[slug]/imports/tracks/route';
import * as flightRoute from '@/app/api/v1/workspaces/[slug]/flights/[id]/route';
import FlightPage from '@/app/(app)/w/[slug]/flights/[id]/page';
import { db } from '@/db/client';
import { runImportsToCompletion } from '@/lib/imports/worker';
import type { ImportDto } from '@/db/imports';
import { HEADER, addScheduleLibrary, csv, uploadRequest } from './imports/support';

vi.mock('next/headers', async () => (await import('../support/request-scope')).nextHeaders);

useTestDatabase();

beforeEach(() => resetScope());

function trackUpload(slug: string, content: string, cookie: string): Request {
  const r = uploadRequest(slug, content, { cookie, fileName: 'flown.csv' });
  return new Request(new URL(`/api/v1/workspaces/${slug}/imports/tracks`, TEST_ORIGIN), {
    method: 'POST',
    headers: r.headers,
    body: r.body,
    duplex: 'half',
  } as RequestInit);
}

/** A workspace with flight PV1 planned at FL370 and flown as a track that climbs to FL390 halfway. */
async function plannedAndFlown() {
  const ws = await makeWorkspace(['analyst']);
  await addScheduleLibrary(ws.id);
  const cookie = await sessionCookie(ws.members.analyst.id);
  const plan = await call<ImportDto>(
    importsRoute.POST,
    uploadRequest(ws.slug, csv(HEADER, '2026-11-03,PV1,ENGM,BIKF,T-LR,370,9000'), { cookie }),
    { slug: ws.slug },
  );
  expect(plan.status).toBe(202);
  const rows = ['flight,date,time,lat,lon,flight_level,origin,destination'];
  for (let i = 0; i <= 10; i++)
    rows.push(
      `PV1,2026-11-03,10:${String(i * 5).padStart(2, '0')}:00,${60 + i * 0.4},${10 - i * 2},${i < 5 ? 370 : 390},ENGM,BIKF`,
    );
  const flown = await call<ImportDto>(tracksRoute.POST, trackUpload(ws.slug, csv(...rows), cookie), { slug: ws.slug });
  expect(flown.status).toBe(202);
  await runImportsToCompletion();
  const planned = await db()('flights').where({ workspace_id: ws.id, basis: 'planned' }).first();
  const track = await db()('flights').where({ workspace_id: ws.id, basis: 'flown' }).first();
  return { ws, cookie, plannedId: Number(planned.id), flownId: Number(track.id) };
}

describe('the flight page and GET /flights/{id}', () => {
  it('pairs a planned flight with its flown track (same flight, date, origin, destination) and gives the differences', async () => {
    const { ws, cookie, plannedId, flownId } = await plannedAndFlown();
    const r = await call<{
      basis: string;
      paired: { id: number; basis: string; trackPoints: number } | null;
      comparison: {
        planned: { noxAboveTropopauseKg: number };
        flown: { noxAboveTropopauseKg: number };
        noxAboveDeltaKg: number;
        shareAboveDelta: number;
      };
    }>(flightRoute.GET, apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights/${plannedId}`, { cookie }), {
      slug: ws.slug,
      id: String(plannedId),
    });
    expect(r.status).toBe(200);
    expect(r.body.basis).toBe('planned');
    expect(r.body.paired).toMatchObject({ id: flownId, basis: 'flown', trackPoints: 11 });
    const c = r.body.comparison;
    expect(c.noxAboveDeltaKg).toBeCloseTo(c.flown.noxAboveTropopauseKg - c.planned.noxAboveTropopauseKg, 9);
    // Both sides are screened; the flown track carries the plan's fuel spread by its own time.
    expect(c.planned.noxAboveTropopauseKg).toBeGreaterThan(0);
    expect(c.flown.noxAboveTropopauseKg).toBeGreaterThan(0);
    const back = await call<{ paired: { id: number } }>(
      flightRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights/${flownId}`, { cookie }),
      { slug: ws.slug, id: String(flownId) },
    );
    expect(back.body.paired.id).toBe(plannedId);
  });

  it('a different flight date or destination is not paired', async () => {
    const { ws, cookie, plannedId } = await plannedAndFlown();
    await db()('flights').where({ workspace_id: ws.id, basis: 'flown' }).update({ destination: 'BGSF' });
    const r = await call<{ paired: unknown; comparison: unknown }>(
      flightRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights/${plannedId}`, { cookie }),
      { slug: ws.slug, id: String(plannedId) },
    );
    expect(r.body.paired).toBeNull();
    expect(r.body.comparison).toBeNull();
  });

  it('200 for a flight of the workspace (page and API); 404 for another workspace’s flight', async () => {
    const { ws, cookie, plannedId } = await plannedAndFlown();
    const other = await makeWorkspace(['analyst']);
    const otherCookie = await sessionCookie(other.members.analyst.id);
    const api404 = await call(
      flightRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${other.slug}/flights/${plannedId}`, { cookie: otherCookie }),
      { slug: other.slug, id: String(plannedId) },
    );
    expect(api404.status).toBe(404);

    resetScope(cookie);
    const page = await FlightPage({ params: Promise.resolve({ slug: ws.slug, id: String(plannedId) }) });
    expect(page).toBeTruthy();
    // The page's element tree (not rendered here): the header names the flight, and the planned-vs-flown part gets both sides.
    const tree = JSON.stringify(page);
    expect(tree).toContain('PV1 · ENGM → BIKF');
    expect(tree).toContain('"comparison":{"planned"');

    resetScope(otherCookie);
    await expect(FlightPage({ params: Promise.resolve({ slug: other.slug, id: String(plannedId) }) })).rejects.toThrow(
      /NEXT_HTTP_ERROR_FALLBACK;404|NEXT_NOT_FOUND/,
    );
  });
});
