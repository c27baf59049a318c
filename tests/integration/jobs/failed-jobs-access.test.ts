import { describe, expect, it, vi } from 'vitest';
import { setActionRequest } from '../../support/next-request';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as failedRoute from '@/app/api/v1/workspaces/[slug]/jobs/failed/route';
import { recordJobFailure } from '@/db/jobs';
import { ROLES, can, type Role } from '@/lib/auth/policy';
import { listFailedJobs } from '@/lib/jobs/failed-jobs';
import { retryFailedJobAction } from '@/app/(app)/w/[slug]/imports/actions';

vi.mock('next/headers', () => import('../../support/next-request'));
vi.mock('next/cache', () => ({ revalidatePath: () => undefined }));

useTestDatabase();

describe('failed background jobs: owners only', () => {
  it('only the owner role holds jobs:manage', () => {
    expect(ROLES.filter((r) => can(r, 'jobs:manage'))).toEqual(['owner']);
  });

  it('every role: the list answers 200 to the owner and 403 to the others; the retry works once, for the owner only', async () => {
    const ws = await makeWorkspace(['planner', 'analyst', 'viewer', 'billing']);
    const other = await makeWorkspace([]);
    // A dead letter of an import step that names a missing import: a retry queues it and changes nothing else.
    const failureId = await recordJobFailure({
      workspaceId: ws.id,
      jobName: 'import.screen',
      payloadJson: JSON.stringify({ importId: 999_999, workspaceId: ws.id }),
      reason: 'The database refused the job\u2019s work (error code 23514); the worker log has the details.',
      attempts: 5,
    });
    await recordJobFailure({
      workspaceId: other.id,
      jobName: 'import.screen',
      payloadJson: JSON.stringify({ importId: 999_998, workspaceId: other.id }),
      reason: 'other',
      attempts: 5,
    });
    const members = { ...(ws.members as Record<Role, { id: number }>), owner: ws.owner };
    for (const role of ROLES) {
      const cookie = await sessionCookie(members[role].id);
      const r = await call<{ items: { id: number; label: string }[] }>(
        failedRoute.GET,
        apiRequest('GET', `/api/v1/workspaces/${ws.slug}/jobs/failed`, { cookie }),
        { slug: ws.slug },
      );
      expect(r.status, role).toBe(role === 'owner' ? 200 : 403);
      if (role === 'owner')
        expect(r.body.items, 'only its own workspace').toEqual([
          expect.objectContaining({ id: failureId, label: 'Screening of import #999999', attempts: 5 }),
        ]);
      setActionRequest({ cookie });
      const s = await retryFailedJobAction(ws.slug, failureId);
      expect(s && !s.ok ? s.error.code : 'ok', role).toBe(role === 'owner' ? 'ok' : 'forbidden');
    }
    // The loop's owner call queued it again; the failure left the list and a second retry is a 404.
    expect(await listFailedJobs({ workspaceId: ws.id })).toEqual([]);
    setActionRequest({ cookie: await sessionCookie(ws.owner.id) });
    const again = await retryFailedJobAction(ws.slug, failureId);
    expect(again && !again.ok ? again.error.code : 'ok').toBe('not_found');
    // Another workspace's owner cannot name this workspace's failure, even through their own workspace.
    setActionRequest({ cookie: await sessionCookie(other.owner.id) });
    const [theirs] = await listFailedJobs({ workspaceId: other.id });
    const cross = await retryFailedJobAction(other.slug, failureId);
    expect(cross && !cross.ok ? cross.error.code : 'ok').toBe('not_found');
    expect(await listFailedJobs({ workspaceId: other.id })).toEqual([theirs]);
  });
});
