'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { requireActionMember } from '@/lib/auth/guards';
import { createApiKey, revokeApiKey } from '@/db/api-keys';
import { apiKeyCreateSchema } from '@/lib/validation/workspaces';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';
import { formText } from '@/lib/validation/action-input';

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

/**
 * The same, posted as an ordinary form (slug in a hidden field): works before the page's script has
 * loaded, and the new key comes back in the page, never in a URL.
 */
export async function createApiKeyFormAction(
  _prev: ActionState<{ key: string; name: string }>,
  form: FormData | unknown,
): Promise<ActionState<{ key: string; name: string }>> {
  const field = (n: string) => formText(form, n);
  try {
    const ctx = await requireActionMember(String(field('slug') ?? ''), 'apikeys:manage');
    const parsed = apiKeyCreateSchema.safeParse({ name: field('name'), role: field('role') });
    if (!parsed.success) throw fromZod(parsed.error);
    const k = await createApiKey({ workspaceId: ctx.workspace.id }, { ...parsed.data, createdBy: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${ctx.workspace.slug}/settings/api-keys`);
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
