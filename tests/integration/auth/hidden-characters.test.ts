import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as workspacesRoute from '@/app/api/v1/workspaces/route';
import * as keysRoute from '@/app/api/v1/workspaces/[slug]/api-keys/route';
import * as fleetsRoute from '@/app/api/v1/workspaces/[slug]/fleets/route';
import { signUpSchema } from '@/lib/validation/auth';

useTestDatabase({ RATE_LIMIT_API_PER_MIN: '1000000' });

// Right-to-left override, zero-width space, bell, byte-order mark, left-to-right isolate, line separator.
const HIDDEN = [
  'Fleet\u202Etxt.exe',
  'Zero\u200Bwidth',
  'Bell\u0007',
  'Bom\uFEFFname',
  'Iso\u2066late',
  'Two\u2028lines',
];

describe('names refuse control, invisible and text-direction characters', () => {
  it.each(HIDDEN)('%j is refused as a workspace, key and fleet name with the field named', async (name) => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const created = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name } }),
    );
    expect(created.status).toBe(422);
    expect(created.body.error?.fields?.[0]?.path).toBe('name');
    const key = await call(
      keysRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/api-keys`, { cookie, body: { name, role: 'viewer' } }),
      { slug: ws.slug },
    );
    expect(key.status).toBe(422);
    const fleet = await call(
      fleetsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/fleets`, { cookie, body: { name } }),
      { slug: ws.slug },
    );
    expect(fleet.status).toBe(422);
    expect(signUpSchema.safeParse({ name, email: 'a@operator.example', password: 'stratus-lantern-41' }).success).toBe(
      false,
    );
  });

  it('ordinary names in other scripts and with accents pass', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    for (const name of ['Åsa Øberg Aviation', 'طيران الشمال', '北極航空', 'Zoë & Sons']) {
      expect(
        (await call(workspacesRoute.POST, apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name } }))).status,
      ).toBe(201);
    }
  });
});
