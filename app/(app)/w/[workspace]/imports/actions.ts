'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { requireActionMember } from '@/lib/auth/guards';
import { deleteImport } from '@/db/imports';
import { rescreenImport } from '@/lib/imports/rescreen';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

const idSchema = z.coerce.number({ error: 'The import id must be a number.' }).int().positive({ error: 'The import id must be a number.' });

/** Deletes an import and its flights; units already billed stay in the ledger. */
export async function deleteImportAction(slug: string, rawId: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'imports:delete');
    const id = idSchema.safeParse(rawId);
    if (!id.success) throw fromZod(id.error, 'id');
    const r = await deleteImport({ workspaceId: ctx.workspace.id }, id.data, { userId: ctx.user.id, label: ctx.user.email });
    revalidatePath(`/w/${slug}/imports`);
    revalidatePath(`/w/${slug}/flights`);
    return {
      ok: true,
      message: `Import #${r.id} (${r.fileName}) and its ${r.flightsDeleted} flights were deleted. ${r.billedUnitsKept} unit${r.billedUnitsKept === 1 ? '' : 's'} already billed stay billed.`,
    };
  } catch (err) {
    return toActionState(err);
  }
}

/** Queues a re-screen of an import's flights with the current engine (in the background, not billed). */
export async function rescreenImportAction(slug: string, rawId: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'imports:create');
    const id = idSchema.safeParse(rawId);
    if (!id.success) throw fromZod(id.error, 'id');
    const imp = await rescreenImport({ workspaceId: ctx.workspace.id }, id.data, { userId: ctx.user.id, label: ctx.user.email });
    revalidatePath(`/w/${slug}/imports`);
    return { ok: true, message: `Import #${imp.id}: ${imp.rescreen?.rows ?? 0} flights are being screened again with engine version ${imp.rescreen?.engineVersion ?? ''}; not billed again.` };
  } catch (err) {
    return toActionState(err);
  }
}
