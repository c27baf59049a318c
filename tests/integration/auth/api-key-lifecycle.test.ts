import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeUser, makeWorkspace, useTestDatabase } from '../../support/test-db';
import { createApiKey } from '@/lib/auth/api-keys';
import { removeMember } from '@/db/workspaces';
import { changeMemberRole } from '@/lib/workspaces/service';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import { db } from '@/db/client';

useTestDatabase({ RATE_LIMIT_API_PER_MIN: '1000000' });

async function secondOwner(workspaceId: number): Promise<{ id: number; email: string }> {
  const u = await makeUser('owner2');
  await db()('memberships').insert({
    workspace_id: workspaceId,
    user_id: u.id,
    role: 'owner',
    created_at: new Date().toISOString(),
  });
  return u;
}

const list = (slug: string, bearer: string) =>
  call(screeningsRoute.GET, apiRequest('GET', `/api/v1/workspaces/${slug}/screenings`, { bearer }), { slug });

describe('API keys die with their creator access', () => {
  it("a removed owner's key stops reading and writing at once, and the revocation is in the audit log", async () => {
    const ws = await makeWorkspace();
    const leaver = await secondOwner(ws.id);
    const key = await createApiKey(
      { workspaceId: ws.id },
      { name: 'leaver ci', role: 'analyst', createdBy: leaver.id, actor: leaver.email },
    );
    const stays = await createApiKey(
      { workspaceId: ws.id },
      { name: 'owner ci', role: 'analyst', createdBy: ws.owner.id, actor: ws.owner.email },
    );
    expect((await list(ws.slug, key.key)).status).toBe(200);

    await removeMember({ workspaceId: ws.id }, { userId: leaver.id, actorId: ws.owner.id, actor: ws.owner.email });
    expect((await list(ws.slug, key.key)).status).toBe(401);
    const write = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { bearer: key.key, body: {} }),
      { slug: ws.slug },
    );
    expect(write.status).toBe(401);
    expect((await list(ws.slug, stays.key)).status).toBe(200);
    const audit = await db()('audit_log')
      .where({ workspace_id: ws.id, action: 'apikey.revoked' })
      .select('target', 'detail');
    expect(audit).toHaveLength(1);
    expect(audit[0].target).toContain('leaver ci');
    expect(String(audit[0].detail)).toContain('left the workspace');
  });

  it('an owner moved to a role without key management loses the keys they made', async () => {
    const ws = await makeWorkspace();
    const demoted = await secondOwner(ws.id);
    const key = await createApiKey(
      { workspaceId: ws.id },
      { name: 'demoted ci', role: 'viewer', createdBy: demoted.id, actor: demoted.email },
    );
    await changeMemberRole(
      { workspaceId: ws.id },
      { userId: demoted.id, role: 'analyst', actorId: ws.owner.id, actor: ws.owner.email },
    );
    expect((await list(ws.slug, key.key)).status).toBe(401);
    expect(await db()('api_keys').where({ id: key.id }).whereNotNull('revoked_at').first()).toBeDefined();
  });

  it('a key whose creator lost access before this rule existed is refused as well', async () => {
    const ws = await makeWorkspace();
    const gone = await secondOwner(ws.id);
    const key = await createApiKey(
      { workspaceId: ws.id },
      { name: 'old ci', role: 'viewer', createdBy: gone.id, actor: gone.email },
    );
    // As an older version left it: membership gone, key not revoked.
    await db()('memberships').where({ workspace_id: ws.id, user_id: gone.id }).delete();
    expect((await list(ws.slug, key.key)).status).toBe(401);
  });
});
