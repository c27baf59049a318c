'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { createApiKey, revokeApiKey } from '@/db/api-keys';
import { apiKeyCreateSchema } from '@/lib/validation/workspaces';
import { workspaceAction } from '@/lib/actions/workspace-action';

export const createApiKeyAction = workspaceAction('apikeys:manage', apiKeyCreateSchema, async (ctx, input) => {
  const k = await createApiKey({ workspaceId: ctx.workspace.id }, { ...input, createdBy: ctx.user.id, actor: ctx.user.email });
  revalidatePath(`/w/${ctx.slug}/settings/api-keys`);
  return { data: { key: k.key, name: k.name } };
});

export const revokeApiKeyAction = workspaceAction('apikeys:manage', z.object({ id: z.coerce.number().int().positive() }), async (ctx, { id }) => {
  await revokeApiKey({ workspaceId: ctx.workspace.id }, { id, actorId: ctx.user.id, actor: ctx.user.email });
  revalidatePath(`/w/${ctx.slug}/settings/api-keys`);
});
