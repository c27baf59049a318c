'use server';

import { revalidatePath } from 'next/cache';
import { deleteSounding } from '@/db/soundings';
import { noInput, workspaceRowAction } from '@/lib/actions/workspace-action';

export const deleteSoundingAction = workspaceRowAction('library:write', noInput, async (ctx, id) => {
  await deleteSounding({ workspaceId: ctx.workspace.id }, id, ctx.by);
  revalidatePath(`/w/${ctx.slug}/soundings`);
});
