'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { buildFleetReport } from '@/lib/reports/build';
import { sendReport } from '@/lib/reports/send';
import { deleteReport } from '@/db/reports';
import { reportCreateSchema, reportSendFormSchema, reportSendSchema, splitRecipients } from '@/lib/validation/reports';
import { fromZod, invalidFields, toActionState, type ActionState } from '@/lib/errors';
import { z } from 'zod';

export async function createReportAction(slug: string, raw: unknown): Promise<ActionState<{ id: number }>> {
  try {
    const ctx = await requireActionMember(slug, 'reports:create');
    const parsed = reportCreateSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const report = await buildFleetReport(
      { workspaceId: ctx.workspace.id },
      { ...parsed.data, workspaceName: ctx.workspace.name, units: ctx.user.units, createdBy: ctx.user.id, actor: ctx.user.email, actorName: ctx.user.name || ctx.user.email },
    );
    revalidatePath(`/w/${slug}/reports`);
    return { ok: true, data: { id: report.id }, message: `Report “${report.name}” built.` };
  } catch (err) {
    return toActionState(err);
  }
}

const reportIdSchema = z.coerce.number().int().positive();

export async function sendReportAction(slug: string, reportId: unknown, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'reports:send');
    const id = reportIdSchema.safeParse(reportId);
    if (!id.success) throw invalidFields([{ path: 'reportId', message: 'Choose a report.' }]);
    const form = reportSendFormSchema.safeParse(raw);
    if (!form.success) throw fromZod(form.error);
    const parsed = reportSendSchema.safeParse({ recipients: splitRecipients(form.data.recipientsText), note: form.data.note || undefined });
    if (!parsed.success) throw fromZod(parsed.error);
    const send = await sendReport(
      { workspaceId: ctx.workspace.id },
      { reportId: id.data, recipients: parsed.data.recipients, note: parsed.data.note, sentBy: ctx.user.id, senderName: ctx.user.name || ctx.user.email, actor: ctx.user.email },
    );
    revalidatePath(`/w/${slug}/reports/${id.data}`);
    revalidatePath(`/w/${slug}/reports`);
    return { ok: true, message: `Sent to ${send.recipients.join(', ')}.` };
  } catch (err) {
    revalidatePath(`/w/${slug}/reports`);
    return toActionState(err);
  }
}

export async function deleteReportAction(slug: string, reportId: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'reports:delete');
    const id = reportIdSchema.safeParse(reportId);
    if (!id.success) throw invalidFields([{ path: 'reportId', message: 'Choose a report.' }]);
    await deleteReport({ workspaceId: ctx.workspace.id }, id.data, { userId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/reports`);
    return { ok: true, message: 'Report deleted.' };
  } catch (err) {
    return toActionState(err);
  }
}
