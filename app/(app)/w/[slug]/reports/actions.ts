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
    return {
      message: `Queued for ${send.recipients.join(', ')}. It goes out in the background; the e-mail history shows when it is sent.`,
    };
  },
);

export const deleteReportAction = workspaceRowAction('reports:delete', noInput, async (ctx, reportId) => {
  await deleteReport({ workspaceId: ctx.workspace.id }, reportId, ctx.by);
  revalidatePath(`/w/${ctx.slug}/reports`);
  return { message: 'Report deleted.' };
});
