import { describe, expect, it, vi, beforeEach } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { resetScope } from '../../support/request-scope';
import { authOptions } from '@/lib/auth/options';
import { userFromSessionToken } from '@/lib/auth/session';
import { requireMember } from '@/lib/auth/guards';
import { createApiKeyAction } from '@/app/(app)/w/[slug]/settings/api-keys/actions';
import * as workspacesRoute from '@/app/api/v1/workspaces/route';
import { db } from '@/db/client';
import { decode } from 'next-auth/jwt';
import { TEST_SECRET } from '../../support/test-db';

vi.mock('next/headers', async () => (await import('../../support/request-scope')).nextHeaders);

useTestDatabase();
beforeEach(() => resetScope());

async function signOutWith(cookie: string): Promise<void> {
  const raw = cookie.split('=')[1];
  const token = await decode({ token: raw, secret: TEST_SECRET });
  const signOut = authOptions().events?.signOut;
  if (!signOut || !token) throw new Error('no sign-out event');
  await signOut({ token, session: undefined as never });
}

describe('sign-out ends the session', () => {
  it('the saved cookie is refused by route handlers, pages and server actions once its session has signed out', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const other = await sessionCookie(ws.owner.id);

    expect((await call(workspacesRoute.GET, apiRequest('GET', '/api/v1/workspaces', { cookie }))).status).toBe(200);
    resetScope(cookie);
    expect((await requireMember(ws.slug, 'apikeys:manage')).user.id).toBe(ws.owner.id);

    await signOutWith(cookie);
    expect(
      await db()('auth_sessions').where({ user_id: ws.owner.id }).whereNotNull('revoked_at').select('id'),
    ).toHaveLength(1);

    // Route handler.
    expect((await call(workspacesRoute.GET, apiRequest('GET', '/api/v1/workspaces', { cookie }))).status).toBe(401);
    // Page guard: a redirect to sign-in, not the page.
    resetScope(cookie);
    await expect(requireMember(ws.slug, 'apikeys:manage')).rejects.toMatchObject({
      digest: expect.stringContaining('/signin'),
    });
    // Server action.
    resetScope(cookie);
    const state = await createApiKeyAction(ws.slug, { name: 'after sign-out', role: 'viewer' });
    expect(state).toMatchObject({ ok: false, error: { code: 'unauthenticated' } });
    expect(await db()('api_keys').where({ name: 'after sign-out' }).first()).toBeUndefined();

    // Only that session ended: another device of the same user stays signed in.
    expect((await userFromSessionToken(other.split('=')[1]))?.id).toBe(ws.owner.id);
  });

  it('a token without a recorded session is refused', async () => {
    const ws = await makeWorkspace();
    const forged = await sessionCookie(ws.owner.id, { sid: 'never-recorded' });
    expect((await call(workspacesRoute.GET, apiRequest('GET', '/api/v1/workspaces', { cookie: forged }))).status).toBe(
      401,
    );
  });

  it('next-auth records a session id in every token it issues', async () => {
    const ws = await makeWorkspace();
    const jwt = authOptions().callbacks?.jwt;
    if (!jwt) throw new Error('no jwt callback');
    const token = await jwt({
      token: {},
      user: { id: String(ws.owner.id), email: ws.owner.email },
      account: null,
      trigger: 'signIn',
    });
    expect(typeof token.sid).toBe('string');
    expect(
      await db()('auth_sessions')
        .where({ id: String(token.sid), user_id: ws.owner.id })
        .whereNull('revoked_at')
        .first(),
    ).toBeDefined();
  });
});
