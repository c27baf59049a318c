'use server';

import { requireActionUser } from '@/lib/auth/guards';
import { createWorkspace } from '@/db/workspaces';
import { workspaceCreateSchema } from '@/lib/validation/workspaces';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

export async function createWorkspaceAction(raw: unknown): Promise<ActionState<{ slug: string }>> {
  try {
    const user = await requireActionUser();
    const parsed = workspaceCreateSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const ws = await createWorkspace({ name: parsed.data.name, slug: parsed.data.slug, ownerId: user.id, actor: user.email });
    return { ok: true, data: { slug: ws.slug } };
  } catch (err) {
    return toActionState(err);
  }
}
