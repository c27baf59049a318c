'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { requireActionMember } from '@/lib/auth/guards';
import { createApiKey, revokeApiKey } from '@/db/api-keys';
import { apiKeyCreateSchema } from '@/lib/validation/workspaces';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

export async function createApiKeyAction(slug: string, raw: unknown): Promise<ActionState<{ key: string; name: string }>> {
  try {
    const ctx = await requireActionMember(slug, 'apikeys:manage');
    const parsed = apiKeyCreateSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const k = await createApiKey({ workspaceId: ctx.workspace.id }, { ...parsed.data, createdBy: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/settings/api-keys`);
    return { ok: true, data: { key: k.key, name: k.name } };
  } catch (err) {
    return toActionState(err);
  }
}

export async function revokeApiKeyAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'apikeys:manage');
    const parsed = z.object({ id: z.coerce.number().int().positive() }).safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await revokeApiKey({ workspaceId: ctx.workspace.id }, { id: parsed.data.id, actorId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/settings/api-keys`);
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
