'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { removeMember, revokeInvitation } from '@/db/workspaces';
import { changeMemberRole, createInvitation } from '@/lib/workspaces/service';
import { invitationCreateSchema, memberRoleSchema } from '@/lib/validation/workspaces';
import { sendMail } from '@/lib/mail/mailer';
import { invitationMail } from '@/lib/mail/templates';
import { appUrl } from '@/lib/env';
import { ROLE_LABELS } from '@/lib/auth/policy';
import { limitEmailSend } from '@/lib/auth/throttle';
import { workspaceAction } from '@/lib/actions/workspace-action';

const page = (slug: string) => `/w/${slug}/settings/members`;

export const inviteMemberAction = workspaceAction('members:manage', invitationCreateSchema, async (ctx, input) => {
  await limitEmailSend('invite', input.email.toLowerCase());
  const { invitation, token } = await createInvitation(
    { workspaceId: ctx.workspace.id },
    { email: input.email, role: input.role, invitedBy: ctx.user.id, actor: ctx.user.email },
  );
  await sendMail(
    invitationMail(invitation.email, {
      workspaceName: ctx.workspace.name,
      roleLabel: ROLE_LABELS[invitation.role],
      inviter: ctx.user.name || ctx.user.email,
      url: new URL(`/invite/${token}`, appUrl()).toString(),
    }),
  );
  revalidatePath(page(ctx.slug));
  return { message: `Invitation sent to ${invitation.email}.` };
});

export const changeRoleAction = workspaceAction('members:manage', memberRoleSchema, async (ctx, input) => {
  await changeMemberRole({ workspaceId: ctx.workspace.id }, { ...input, actorId: ctx.user.id, actor: ctx.user.email });
  revalidatePath(page(ctx.slug));
  return { message: 'Role changed.' };
});

const idSchema = z.object({ id: z.coerce.number().int().positive() });

export const removeMemberAction = workspaceAction('members:manage', idSchema, async (ctx, { id }) => {
  await removeMember({ workspaceId: ctx.workspace.id }, { userId: id, actorId: ctx.user.id, actor: ctx.user.email });
  revalidatePath(page(ctx.slug));
  return { message: 'Member removed.' };
});

export const revokeInvitationAction = workspaceAction('members:manage', idSchema, async (ctx, { id }) => {
  await revokeInvitation({ workspaceId: ctx.workspace.id }, id);
  revalidatePath(page(ctx.slug));
});
