'use server';

import { revalidatePath } from 'next/cache';
import { noInput, workspaceRowAction } from '@/lib/actions/workspace-action';
import { rescreenScreening } from '@/lib/screening-service/service';

/** Screens a saved screening again with the current engine (a new screening, not billed). */
export const rescreenScreeningAction = workspaceRowAction('screenings:create', noInput, async (ctx, id) => {
  const { record, replayed } = await rescreenScreening({ workspaceId: ctx.workspace.id }, id, {
    userId: ctx.user.id,
    apiKeyId: null,
  });
  revalidatePath(`/w/${ctx.slug}/screenings`);
  return {
    data: { id: record.id },
    message: replayed ? `Already screened again as #${record.id}.` : `Screened again as #${record.id}.`,
  };
});
