import { apiRequest, call, sessionCookie } from '../../support/test-db';
import { db, nowIso } from '@/db/client';
import { createApiKey } from '@/db/api-keys';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';

/** A small valid flight (DESIGN.md's screenFlight input). */
export const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 50_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

export interface Ws {
  id: number;
  slug: string;
  owner: { id: number };
}

type Maker = (ws: Ws) => Promise<number>;

/**
 * Makes one row of the right workspace for a route's `[id]`, keyed by the path segment before it.
 * A route whose resource is not listed here is called with a missing id, and its 404 is then
 * ambiguous (the matrix reports those routes).
 */
export const ID_FIXTURES: Record<string, Maker> = {
  screenings: async (ws) => {
    const r = await call<{ id: number }>(screeningsRoute.POST, apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie: await sessionCookie(ws.owner.id), body: FLIGHT }), { slug: ws.slug });
    if (r.status !== 201) throw new Error(`fixture screening: ${r.status} ${JSON.stringify(r.body)}`);
    return r.body.id;
  },
  'api-keys': async (ws) => (await createApiKey({ workspaceId: ws.id }, { name: `fixture-${Date.now()}`, role: 'viewer', createdBy: ws.owner.id, actor: 'fixture' })).id,
  fleets: async (ws) => {
    const [row] = await db()('fleets').insert({ workspace_id: ws.id, name: `Fixture fleet ${Math.random().toString(36).slice(2)}`, description: '', created_at: nowIso() }).returning('id');
    return Number(typeof row === 'object' ? row.id : row);
  },
};

/** The resource name an `[id]` belongs to: `/api/v1/workspaces/[slug]/fleets/[id]/...` -> `fleets`. */
export function resourceOf(pattern: string, param: string): string | undefined {
  const parts = pattern.split('/');
  const i = parts.findIndex((p) => p === `[${param}]`);
  return i > 0 ? parts[i - 1] : undefined;
}
