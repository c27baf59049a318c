'use server';

import { revalidatePath } from 'next/cache';
import { buildFleetReport } from '@/lib/reports/build';
import { sendReport } from '@/lib/reports/send';
import { deleteReport } from '@/db/reports';
import { reportCreateSchema, reportSendFormSchema, reportSendSchema, splitRecipients } from '@/lib/validation/reports';
import { fromZod } from '@/lib/errors';
import { noInput, workspaceAction, workspaceRowAction } from '@/lib/actions/workspace-action';

export const createReportAction = workspaceAction('reports:create', reportCreateSchema, async (ctx, input) => {
  const report = await buildFleetReport(
    { workspaceId: ctx.workspace.id },
    {
      ...input,
      workspaceName: ctx.workspace.name,
      units: ctx.user.units,
      createdBy: ctx.user.id,
      actor: ctx.user.email,
      actorName: ctx.user.name || ctx.user.email,
    },
  );
  revalidatePath(`/w/${ctx.slug}/reports`);
  return { data: { id: report.id }, message: `Report “${report.name}” built.` };
});

export const sendReportAction = workspaceRowAction(
  'reports:send',
  reportSendFormSchema,
  async (ctx, reportId, form) => {
    const parsed = reportSendSchema.safeParse({
      recipients: splitRecipients(form.recipientsText),
      note: form.note || undefined,
    });
    if (!parsed.success) throw fromZod(parsed.error);
    try {
      const send = await sendReport(
        { workspaceId: ctx.workspace.id },
        {
          reportId,
          recipients: parsed.data.recipients,
          note: parsed.data.note,
          sentBy: ctx.user.id,
          senderName: ctx.user.name || ctx.user.email,
          actor: ctx.user.email,
        },
      );
      revalidatePath(`/w/${ctx.slug}/reports/${reportId}`);
      return { message: `Sent to ${send.recipients.join(', ')}.` };
    } finally {
      // A refused or failed send is recorded in the report's history too: the list shows it either way.
      revalidatePath(`/w/${ctx.slug}/reports`);
    }
  },
);

export const deleteReportAction = workspaceRowAction('reports:delete', noInput, async (ctx, reportId) => {
  await deleteReport({ workspaceId: ctx.workspace.id }, reportId, ctx.by);
  revalidatePath(`/w/${ctx.slug}/reports`);
  return { message: 'Report deleted.' };
});
