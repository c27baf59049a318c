'use server';

import { createWorkspace } from '@/db/workspaces';
import { workspaceCreateSchema } from '@/lib/validation/workspaces';
import { userAction } from '@/lib/actions/workspace-action';

export const createWorkspaceAction = userAction(workspaceCreateSchema, async (user, input) => {
  const ws = await createWorkspace({ name: input.name, slug: input.slug, ownerId: user.id, actor: user.email });
  return { data: { slug: ws.slug } };
});
