'use server';

import { revalidatePath } from 'next/cache';
import { deleteImport } from '@/db/imports';
import { rescreenImport } from '@/lib/imports/rescreen';
import { retryFailedJob } from '@/lib/jobs/failed-jobs';
import { noInput, workspaceRowAction } from '@/lib/actions/workspace-action';

/** Deletes an import and its flights; units already billed stay in the ledger. */
export const deleteImportAction = workspaceRowAction('imports:delete', noInput, async (ctx, id) => {
  const r = await deleteImport({ workspaceId: ctx.workspace.id }, id, { userId: ctx.user.id, label: ctx.user.email });
  revalidatePath(`/w/${ctx.slug}/imports`);
  revalidatePath(`/w/${ctx.slug}/flights`);
  return {
    message: `Import #${r.id} (${r.fileName}) and its ${r.flightsDeleted} flights were deleted. ${r.billedUnitsKept} unit${r.billedUnitsKept === 1 ? '' : 's'} already billed stay billed.`,
  };
});

/** Queues a re-screen of an import's flights with the current engine (in the background, not billed). */
export const rescreenImportAction = workspaceRowAction('imports:create', noInput, async (ctx, id) => {
  const imp = await rescreenImport({ workspaceId: ctx.workspace.id }, id, {
    userId: ctx.user.id,
    label: ctx.user.email,
  });
  revalidatePath(`/w/${ctx.slug}/imports`);
  return {
    message: `Import #${imp.id}: ${imp.rescreen?.rows ?? 0} flights are being screened again with engine version ${imp.rescreen?.engineVersion ?? ''}; not billed again.`,
  };
});

/** Queues a failed background job again with fresh attempts (owners; once per failure). */
export const retryFailedJobAction = workspaceRowAction('jobs:manage', noInput, async (ctx, id) => {
  const job = await retryFailedJob({ workspaceId: ctx.workspace.id }, id, {
    userId: ctx.user.id,
    label: ctx.user.email,
  });
  revalidatePath(`/w/${ctx.slug}/imports`);
  return { message: `${job.label}: queued again.` };
});
