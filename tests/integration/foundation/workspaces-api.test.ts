import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeUser, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as workspacesRoute from '@/app/api/v1/workspaces/route';
import { db } from '@/db/client';

useTestDatabase();

type List = { items: { slug: string; name: string; role: string }[] };

describe('GET /api/v1/workspaces', () => {
  it('401 without a session or key, with the error shape', async () => {
    const r = await call(workspacesRoute.GET, apiRequest('GET', '/api/v1/workspaces'));
    expect(r.status).toBe(401);
    expect(r.body.error?.code).toBe('unauthenticated');
  });

  it('lists only the caller’s workspaces with their role', async () => {
    const a = await makeWorkspace(['planner']);
    await makeWorkspace();
    const r = await call<List>(
      workspacesRoute.GET,
      apiRequest('GET', '/api/v1/workspaces', { cookie: await sessionCookie(a.members.planner.id) }),
    );
    expect(r.status).toBe(200);
    expect(r.body.items).toEqual([{ slug: a.slug, name: expect.any(String), role: 'planner' }]);
  });

  it('a forged or foreign-secret cookie is not a session', async () => {
    const r = await call(
      workspacesRoute.GET,
      apiRequest('GET', '/api/v1/workspaces', { cookie: 'next-auth.session-token=not-a-token' }),
    );
    expect(r.status).toBe(401);
  });
});

describe('POST /api/v1/workspaces', () => {
  it('creates a workspace whose creator is owner, with an audit row', async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u.id);
    const r = await call<{ slug: string; role: string }>(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name: 'Nordlys Charter' } }),
    );
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ slug: 'nordlys-charter', role: 'owner' });
    const ws = await db()('workspaces').where({ slug: 'nordlys-charter' }).first();
    expect(await db()('memberships').where({ workspace_id: ws.id, user_id: u.id }).first()).toMatchObject({
      role: 'owner',
    });
    expect(await db()('audit_log').where({ workspace_id: ws.id, action: 'workspace.created' }).first()).toBeTruthy();
    const again = await call<{ slug: string }>(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name: 'Nordlys Charter' } }),
    );
    expect(again.body.slug).toBe('nordlys-charter-2');
  });

  it('422 names the bad field; 400 for unreadable JSON; 409 for a taken address', async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u.id);
    const bad = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name: 'x', slug: '-bad-' } }),
    );
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.map((f) => f.path).sort()).toEqual(['name', 'slug']);
    const broken = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', {
        cookie,
        rawBody: '{"name":',
        headers: { 'content-type': 'application/json' },
      }),
    );
    expect(broken.status).toBe(400);
    expect(broken.body.error?.code).toBe('bad_request');
    await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name: 'Taken', slug: 'taken-one' } }),
    );
    const taken = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, body: { name: 'Taken', slug: 'taken-one' } }),
    );
    expect(taken.status).toBe(409);
    expect(taken.body.error?.fields?.[0]?.path).toBe('slug');
  });

  it('refuses a cookie-authenticated post from a foreign Origin (403), allows its own', async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u.id);
    const foreign = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', { cookie, origin: 'https://evil.example', body: { name: 'Foreign' } }),
    );
    expect(foreign.status).toBe(403);
    expect(await db()('workspaces').where({ name: 'Foreign' }).first()).toBeUndefined();
    const own = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', {
        cookie,
        origin: 'http://127.0.0.1:3999',
        body: { name: 'Own origin' },
      }),
    );
    expect(own.status).toBe(201);
  });

  it('413 for a body over the limit, before parsing', async () => {
    const u = await makeUser();
    const r = await call(
      workspacesRoute.POST,
      apiRequest('POST', '/api/v1/workspaces', {
        cookie: await sessionCookie(u.id),
        rawBody: `{"name":"${'a'.repeat(1_100_000)}"}`,
      }),
    );
    expect(r.status).toBe(413);
    expect(r.body.error?.code).toBe('too_large');
  });
});
