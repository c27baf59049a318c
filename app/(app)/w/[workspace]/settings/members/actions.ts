'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { changeMemberRole, createInvitation, removeMember, revokeInvitation } from '@/db/workspaces';
import { invitationCreateSchema, memberRoleSchema } from '@/lib/validation/workspaces';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';
import { sendMail } from '@/lib/mail/mailer';
import { invitationMail } from '@/lib/mail/templates';
import { appUrl } from '@/lib/env';
import { ROLE_LABELS } from '@/lib/auth/policy';
import { limitEmailSend } from '@/lib/auth/throttle';
import { z } from 'zod';

export async function inviteMemberAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'members:manage');
    const parsed = invitationCreateSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await limitEmailSend('invite', parsed.data.email.toLowerCase());
    const { invitation, token } = await createInvitation(
      { workspaceId: ctx.workspace.id },
      { email: parsed.data.email, role: parsed.data.role, invitedBy: ctx.user.id, actor: ctx.user.email },
    );
    await sendMail(
      invitationMail(invitation.email, {
        workspaceName: ctx.workspace.name,
        roleLabel: ROLE_LABELS[invitation.role],
        inviter: ctx.user.name || ctx.user.email,
        url: new URL(`/invite/${token}`, appUrl()).toString(),
      }),
    );
    revalidatePath(`/w/${slug}/settings/members`);
    return { ok: true, message: `Invitation sent to ${invitation.email}.` };
  } catch (err) {
    return toActionState(err);
  }
}

export async function changeRoleAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'members:manage');
    const parsed = memberRoleSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await changeMemberRole({ workspaceId: ctx.workspace.id }, { ...parsed.data, actorId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/settings/members`);
    return { ok: true, message: 'Role changed.' };
  } catch (err) {
    return toActionState(err);
  }
}

const idSchema = z.object({ id: z.coerce.number().int().positive() });

export async function removeMemberAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'members:manage');
    const parsed = idSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await removeMember({ workspaceId: ctx.workspace.id }, { userId: parsed.data.id, actorId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/settings/members`);
    return { ok: true, message: 'Member removed.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function revokeInvitationAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'members:manage');
    const parsed = idSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await revokeInvitation({ workspaceId: ctx.workspace.id }, parsed.data.id);
    revalidatePath(`/w/${slug}/settings/members`);
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
