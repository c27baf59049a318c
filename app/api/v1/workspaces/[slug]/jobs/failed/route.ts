import { json, workspaceRoute } from '@/lib/api/handler';
import { listFailedJobs } from '@/lib/jobs/failed-jobs';

/** The workspace's failed background jobs (dead letters) not yet retried, newest first: owners only. */
export const GET = workspaceRoute<{ slug: string }>('jobs:manage', async ({ member }) =>
  json({ items: await listFailedJobs({ workspaceId: member.workspace.id }) }),
);
