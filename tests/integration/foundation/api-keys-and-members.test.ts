import { describe, expect, it } from 'vitest';
import {
  apiRequest,
  call,
  makeUser,
  makeWorkspace,
  onPostgres,
  sessionCookie,
  useTestDatabase,
} from '../../support/test-db';
import * as keysRoute from '@/app/api/v1/workspaces/[slug]/api-keys/route';
import * as keyRoute from '@/app/api/v1/workspaces/[slug]/api-keys/[id]/route';
import * as workspacesRoute from '@/app/api/v1/workspaces/route';
import { db } from '@/db/client';
import { removeMember } from '@/db/workspaces';
import { acceptInvitation, changeMemberRole, createInvitation, getInvitationByToken } from '@/lib/workspaces/service';
import { userFromSessionToken } from '@/lib/auth/session';
import { bumpSessionVersion } from '@/db/users';
import { knexAdapter } from '@/lib/auth/adapter';
import { AppError } from '@/lib/errors';

useTestDatabase();

type Created = { id: number; name: string; role: string; key: string };

describe('workspace API keys', () => {
  it('owner creates a key shown once and stored hashed; the key acts in that workspace only', async () => {
    const a = await makeWorkspace();
    const b = await makeWorkspace();
    const cookie = await sessionCookie(a.owner.id);
    const created = await call<Created>(
      keysRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${a.slug}/api-keys`, { cookie, body: { name: 'dispatch' } }),
      { slug: a.slug },
    );
    expect(created.status).toBe(201);
    expect(created.body.role).toBe('planner');
    expect(created.body.key).toMatch(/^tpk_/);
    const stored = await db()('api_keys').where({ id: created.body.id }).first();
    expect(stored.key_hash).not.toContain(created.body.key);
    expect(JSON.stringify(stored)).not.toContain(created.body.key);

    const listed = await call<{ items: Record<string, unknown>[] }>(
      keysRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${a.slug}/api-keys`, { cookie }),
      { slug: a.slug },
    );
    expect(listed.body.items).toHaveLength(1);
    expect(listed.body.items[0]).not.toHaveProperty('key');

    const mine = await call<{ items: { slug: string; role: string }[] }>(
      workspacesRoute.GET,
      apiRequest('GET', '/api/v1/workspaces', { bearer: created.body.key }),
    );
    expect(mine.body.items).toEqual([{ slug: a.slug, name: expect.any(String), role: 'planner' }]);
    const other = await call(
      keysRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${b.slug}/api-keys`, { bearer: created.body.key }),
      { slug: b.slug },
    );
    expect(other.status).toBe(404);
    const ownButForbidden = await call(
      keysRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${a.slug}/api-keys`, { bearer: created.body.key }),
      { slug: a.slug },
    );
    expect(ownButForbidden.status).toBe(403);

    const del = await call(
      keyRoute.DELETE,
      apiRequest('DELETE', `/api/v1/workspaces/${a.slug}/api-keys/${created.body.id}`, { cookie }),
      { slug: a.slug, id: String(created.body.id) },
    );
    expect(del.status).toBe(204);
    const after = await call(
      workspacesRoute.GET,
      apiRequest('GET', '/api/v1/workspaces', { bearer: created.body.key }),
    );
    expect(after.status).toBe(401);
    const actions = (await db()('audit_log').where({ workspace_id: a.id }).select('action')).map((r) => r.action);
    expect(actions).toEqual(expect.arrayContaining(['apikey.created', 'apikey.revoked']));
  });

  it('403 for a planner, 404 for a non-member, 422 for a role a key may not have', async () => {
    const a = await makeWorkspace(['planner']);
    const outsider = await makeUser();
    const planner = await call(
      keysRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${a.slug}/api-keys`, {
        cookie: await sessionCookie(a.members.planner.id),
        body: { name: 'x' },
      }),
      { slug: a.slug },
    );
    expect(planner.status).toBe(403);
    const stranger = await call(
      keysRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${a.slug}/api-keys`, { cookie: await sessionCookie(outsider.id) }),
      { slug: a.slug },
    );
    expect(stranger.status).toBe(404);
    const ownerRole = await call(
      keysRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${a.slug}/api-keys`, {
        cookie: await sessionCookie(a.owner.id),
        body: { name: 'x', role: 'owner' },
      }),
      { slug: a.slug },
    );
    expect(ownerRole.status).toBe(422);
    expect(ownerRole.body.error?.fields?.[0]?.path).toBe('role');
    const unknownKey = await call(
      keyRoute.DELETE,
      apiRequest('DELETE', `/api/v1/workspaces/${a.slug}/api-keys/999999`, { cookie: await sessionCookie(a.owner.id) }),
      { slug: a.slug, id: '999999' },
    );
    expect(unknownKey.status).toBe(404);
  });
});

const expectAppError = async (p: Promise<unknown>, code: string) => {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(AppError);
  expect((err as AppError).code).toBe(code);
};

describe('members and invitations', () => {
  it('the last owner can neither be demoted nor removed; a second owner makes it possible', async () => {
    const a = await makeWorkspace(['planner']);
    await expectAppError(
      changeMemberRole({ workspaceId: a.id }, { userId: a.owner.id, role: 'viewer', actorId: a.owner.id, actor: 'o' }),
      'conflict',
    );
    await expectAppError(
      removeMember({ workspaceId: a.id }, { userId: a.owner.id, actorId: a.owner.id, actor: 'o' }),
      'conflict',
    );
    await changeMemberRole(
      { workspaceId: a.id },
      { userId: a.members.planner.id, role: 'owner', actorId: a.owner.id, actor: 'o' },
    );
    await removeMember({ workspaceId: a.id }, { userId: a.owner.id, actorId: a.owner.id, actor: 'o' });
    expect(await db()('memberships').where({ workspace_id: a.id, user_id: a.owner.id }).first()).toBeUndefined();
  });

  it('removal ends the removed member’s sessions', async () => {
    const a = await makeWorkspace(['analyst']);
    const cookie = await sessionCookie(a.members.analyst.id);
    const token = cookie.split('=')[1];
    expect(await userFromSessionToken(token)).not.toBeNull();
    await removeMember({ workspaceId: a.id }, { userId: a.members.analyst.id, actorId: a.owner.id, actor: 'o' });
    expect(await userFromSessionToken(token)).toBeNull();
  });

  it('invitations: existing member refused; wrong address refused; accepted once; expired refused', async () => {
    const a = await makeWorkspace(['viewer']);
    await expectAppError(
      createInvitation(
        { workspaceId: a.id },
        { email: a.members.viewer.email, role: 'planner', invitedBy: a.owner.id, actor: 'o' },
      ),
      'conflict',
    );
    const invitee = await makeUser('invitee');
    const { token } = await createInvitation(
      { workspaceId: a.id },
      { email: invitee.email.toUpperCase(), role: 'analyst', invitedBy: a.owner.id, actor: 'o' },
    );
    const wrong = await makeUser('wrong');
    await expectAppError(acceptInvitation({ token, userId: wrong.id, email: wrong.email }), 'conflict');
    const ws = await acceptInvitation({ token, userId: invitee.id, email: invitee.email });
    expect(ws.slug).toBe(a.slug);
    expect(await db()('memberships').where({ workspace_id: a.id, user_id: invitee.id }).first()).toMatchObject({
      role: 'analyst',
    });
    await expectAppError(acceptInvitation({ token, userId: invitee.id, email: invitee.email }), 'conflict');
    expect((await getInvitationByToken(token)).state).toBe('used');

    const late = await makeUser('late');
    const second = await createInvitation(
      { workspaceId: a.id },
      { email: late.email, role: 'viewer', invitedBy: a.owner.id, actor: 'o' },
    );
    await db()('invitations').where({ id: second.invitation.id }).update({ expires_at: '2000-01-01T00:00:00.000Z' });
    expect((await getInvitationByToken(second.token)).state).toBe('expired');
    await expectAppError(acceptInvitation({ token: second.token, userId: late.id, email: late.email }), 'conflict');
  });
});

describe('sessions', () => {
  it('a session past the absolute lifetime is refused even if the JWT is unexpired', async () => {
    const u = await makeUser();
    const old = (await sessionCookie(u.id, { authAt: Date.now() - 13 * 3_600_000 })).split('=')[1];
    expect(await userFromSessionToken(old)).toBeNull();
    const fresh = (await sessionCookie(u.id)).split('=')[1];
    expect((await userFromSessionToken(fresh))?.id).toBe(u.id);
  });

  it('sign-out everywhere (session version) ends existing sessions', async () => {
    const u = await makeUser();
    const token = (await sessionCookie(u.id)).split('=')[1];
    await bumpSessionVersion(u.id);
    expect(await userFromSessionToken(token)).toBeNull();
  });

  it('an e-mailed sign-in token is single use', async () => {
    const adapter = knexAdapter();
    const u = await makeUser();
    const expires = new Date(Date.now() + 600_000);
    await adapter.createVerificationToken?.({ identifier: u.email, token: 'hashed-token-value', expires });
    const first = await adapter.useVerificationToken?.({ identifier: u.email, token: 'hashed-token-value' });
    expect(first?.expires.toISOString()).toBe(expires.toISOString());
    expect(await adapter.useVerificationToken?.({ identifier: u.email, token: 'hashed-token-value' })).toBeNull();
  });
});

describe.skipIf(onPostgres())('SQLite connection settings', () => {
  it('runs with WAL, FULL sync, foreign keys and a busy timeout', async () => {
    const pragma = async (name: string) =>
      Object.values((await db().raw(`PRAGMA ${name}`))[0] as Record<string, unknown>)[0];
    expect(await pragma('journal_mode')).toBe('wal');
    expect(await pragma('synchronous')).toBe(2);
    expect(await pragma('foreign_keys')).toBe(1);
    expect(await pragma('busy_timeout')).toBe(5000);
  });
});
