'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { deleteSounding } from '@/db/soundings';
import { toActionState, type ActionState } from '@/lib/errors';
import { actionId } from '@/lib/validation/action-input';

export async function deleteSoundingAction(slug: string, id: number): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    await deleteSounding({ workspaceId: ctx.workspace.id }, actionId(id), { userId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/soundings`);
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
