'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { revokeApiKey } from '@/db/api-keys';
import { createApiKey } from '@/lib/auth/api-keys';
import { apiKeyCreateSchema } from '@/lib/validation/workspaces';
import { workspaceAction } from '@/lib/actions/workspace-action';
import type { ActionState } from '@/lib/errors';
import { formText } from '@/lib/validation/action-input';

export const createApiKeyAction = workspaceAction('apikeys:manage', apiKeyCreateSchema, async (ctx, input) => {
  const k = await createApiKey(
    { workspaceId: ctx.workspace.id },
    { ...input, createdBy: ctx.user.id, actor: ctx.user.email },
  );
  revalidatePath(`/w/${ctx.slug}/settings/api-keys`);
  return { data: { key: k.key, name: k.name } };
});

/**
 * The same, posted as an ordinary form (slug in a hidden field): works before the page's script has
 * loaded, and the new key comes back in the page, never in a URL.
 */
export async function createApiKeyFormAction(
  _prev: ActionState<{ key: string; name: string }>,
  form: FormData | unknown,
): Promise<ActionState<{ key: string; name: string }>> {
  // Only reads the posted fields; every check (origin, membership, permission, schema) is createApiKeyAction's.
  return createApiKeyAction(formText(form, 'slug') ?? '', {
    name: formText(form, 'name'),
    role: formText(form, 'role'),
  });
}

export const revokeApiKeyAction = workspaceAction(
  'apikeys:manage',
  z.object({ id: z.coerce.number().int().positive() }),
  async (ctx, { id }) => {
    await revokeApiKey({ workspaceId: ctx.workspace.id }, { id, actorId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${ctx.slug}/settings/api-keys`);
  },
);
