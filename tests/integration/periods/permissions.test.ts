import { beforeAll, describe, expect, it } from 'vitest';
import { makeWorkspace, useTestDatabase } from '../../support/test-db';
import { db } from '@/db/client';
import { ROLES, can, type Role } from '@/lib/auth/policy';
import { insertFlight, insertType } from '../fleets/flight-fixtures';
import { ROUTES, download, post, putTargets } from './support';

useTestDatabase();

/**
 * Who may do what with a period, written out (not read from the policy table) so a change to the
 * table that moves one of these shows here: analysts prepare (review, targets), owners sign and
 * reopen, everyone who reads flights reads signed reports and audit packs; finance admins see none.
 */
const EXPECTED: Record<string, Record<Role, boolean>> = {
  review: { owner: true, analyst: true, planner: false, viewer: false, billing: false },
  sign: { owner: true, analyst: false, planner: false, viewer: false, billing: false },
  reopen: { owner: true, analyst: false, planner: false, viewer: false, billing: false },
  targets: { owner: true, analyst: true, planner: false, viewer: false, billing: false },
  read: { owner: true, analyst: true, planner: true, viewer: true, billing: false },
};

let ws: Awaited<ReturnType<typeof makeWorkspace>>;
let month = 0;

beforeAll(async () => {
  ws = await makeWorkspace(['planner', 'analyst', 'viewer', 'billing']);
  const typeId = await insertType(ws.id, 'PX-1', null);
  for (let m = 1; m <= 12; m++)
    await insertFlight(ws.id, {
      date: `2025-${String(m).padStart(2, '0')}-10`,
      flight: 'PX',
      typeId,
      code: 'PX-1',
      distanceKm: 5000,
      fuelKg: 30000,
      noxKg: 400,
      noxAboveKg: 150,
    });
});

/** A fresh month of 2025 in the state asked for, moved there by the owner. */
async function periodIn(state: 'open' | 'review' | 'signed'): Promise<string> {
  const ref = `${2025 + Math.floor(month / 12)}-${String((month % 12) + 1).padStart(2, '0')}`;
  month += 1;
  if (state !== 'open')
    expect((await post(ROUTES.reviewRoute.POST, ws.slug, ref, '/review', ws.owner.id)).status).toBe(200);
  if (state === 'signed')
    expect((await post(ROUTES.signRoute.POST, ws.slug, ref, '/sign', ws.owner.id)).status).toBe(200);
  return ref;
}

const allowedStatus = (s: number) => s !== 401 && s !== 403 && s !== 404 && s < 500;

describe('period permissions over the whole role matrix', () => {
  it('the policy table gives exactly the expected roles each period permission', () => {
    const perm = {
      review: 'periods:review',
      sign: 'periods:sign',
      reopen: 'periods:reopen',
      targets: 'targets:write',
      read: 'flights:read',
    } as const;
    for (const [action, roles] of Object.entries(EXPECTED))
      for (const role of ROLES)
        expect(can(role, perm[action as keyof typeof perm]), `${role} ${action}`).toBe(roles[role]);
  });

  it.each(ROLES)(
    '%s: review, sign, reopen, targets and reading a signed period answer as the table says',
    async (role) => {
      const user = ws.members[role];

      const forReview = await periodIn('open');
      const r = await post(ROUTES.reviewRoute.POST, ws.slug, forReview, '/review', user.id);
      expect(r.status, `review as ${role}`).toBe(EXPECTED.review[role] ? 200 : 403);

      const forSign = await periodIn('review');
      const s = await post(ROUTES.signRoute.POST, ws.slug, forSign, '/sign', user.id);
      expect(s.status, `sign as ${role}`).toBe(EXPECTED.sign[role] ? 200 : 403);
      const state = (await db()('reporting_periods').where({ workspace_id: ws.id, key: forSign }).first()).state;
      expect(state).toBe(EXPECTED.sign[role] ? 'signed' : 'review');

      const forReopen = await periodIn('signed');
      const o = await post(ROUTES.reopenRoute.POST, ws.slug, forReopen, '/reopen', user.id, {
        reason: 'Permissions check',
      });
      expect(o.status, `reopen as ${role}`).toBe(EXPECTED.reopen[role] ? 200 : 403);

      const t = await putTargets(ws.slug, '2030-Q1', user.id, [{ fleetId: null, metric: 'noxAboveT', value: 5 }]);
      expect(allowedStatus(t.status), `targets as ${role}: ${t.status}`).toBe(EXPECTED.targets[role]);
      if (!EXPECTED.targets[role]) expect(t.status).toBe(403);

      const signed = await periodIn('signed');
      const pack = await download(ROUTES.auditPackRoute.GET, ws.slug, signed, '/audit-pack', user.id);
      expect(pack.status, `audit pack as ${role}`).toBe(EXPECTED.read[role] ? 200 : 403);
      const pdf = await download(ROUTES.reportRoute.GET, ws.slug, signed, '/report', user.id);
      expect(pdf.status, `signed report as ${role}`).toBe(EXPECTED.read[role] ? 200 : 403);
    },
  );
});
