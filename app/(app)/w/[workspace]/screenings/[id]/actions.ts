'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { requireActionMember } from '@/lib/auth/guards';
import { rescreenScreening } from '@/lib/screenings/service';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

const idSchema = z.coerce.number({ error: 'The screening id must be a number.' }).int().positive({ error: 'The screening id must be a number.' });

/** Screens a saved screening again with the current engine (a new screening, not billed). */
export async function rescreenScreeningAction(slug: string, rawId: unknown): Promise<ActionState<{ id: number }>> {
  try {
    const ctx = await requireActionMember(slug, 'screenings:create');
    const id = idSchema.safeParse(rawId);
    if (!id.success) throw fromZod(id.error, 'id');
    const { record, replayed } = await rescreenScreening({ workspaceId: ctx.workspace.id }, id.data, { userId: ctx.user.id, apiKeyId: null });
    revalidatePath(`/w/${slug}/screenings`);
    return { ok: true, data: { id: record.id }, message: replayed ? `Already screened again as #${record.id}.` : `Screened again as #${record.id}.` };
  } catch (err) {
    return toActionState(err);
  }
}
