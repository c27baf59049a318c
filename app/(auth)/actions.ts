'use server';

import { headers } from 'next/headers';
import { signUpSchema, emailOnlySchema, resetPasswordSchema } from '@/lib/validation/auth';
import { conflict, fromZod, toActionState, type ActionState, badRequest } from '@/lib/errors';
import { hashPassword } from '@/lib/auth/password';
import { createUser, getUserByEmail, normaliseEmail } from '@/db/users';
import { writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import { createWorkspace, acceptInvitation, getInvitationByToken } from '@/db/workspaces';
import { createResetToken, consumeResetToken } from '@/db/reset-tokens';
import { limitEmailSend } from '@/lib/auth/throttle';
import { sendMail } from '@/lib/mail/mailer';
import { passwordResetMail } from '@/lib/mail/templates';
import { appUrl } from '@/lib/env';
import { assertSameOrigin } from '@/lib/auth/origin';
import { log } from '@/lib/log';

async function ip(): Promise<string> {
  const h = await headers();
  return (h.get('x-forwarded-for')?.split(',')[0] ?? '127.0.0.1').trim();
}

/** Creates an account (and optionally a first workspace, or joins the invitation's workspace). */
export async function signUpAction(raw: unknown, invitationToken?: string): Promise<ActionState<{ next: string }>> {
  try {
    await assertSameOrigin();
    const parsed = signUpSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const input = parsed.data;
    const email = normaliseEmail(input.email);
    let invitedEmail: string | undefined;
    if (invitationToken) {
      const inv = await getInvitationByToken(invitationToken);
      if (inv.state !== 'open') throw badRequest('This invitation can no longer be used; ask for a new one.');
      invitedEmail = inv.email;
      if (invitedEmail !== email) {
        throw conflict(`This invitation was sent to ${invitedEmail}.`, [{ path: 'email', message: `Use the invited address, ${invitedEmail}.` }]);
      }
    }
    if (await getUserByEmail(email)) {
      throw conflict('An account with this e-mail already exists.', [
        { path: 'email', message: 'An account with this e-mail already exists. Sign in instead, or reset the password.' },
      ]);
    }
    const passwordHash = await hashPassword(input.password);
    const address = await ip();
    const user = await writeTx(async (trx) => {
      const u = await createUser({ email, name: input.name, passwordHash, emailVerified: !!invitedEmail }, trx);
      await createAuditEntry({ userId: u.id, actor: u.email, action: 'user.signed_up', ip: address }, trx);
      return u;
    }).catch((err: unknown) => {
      if (err instanceof Error && /UNIQUE|unique/.test(err.message)) {
        throw conflict('An account with this e-mail already exists.', [{ path: 'email', message: 'An account with this e-mail already exists.' }]);
      }
      throw err;
    });
    let next = '/workspaces';
    if (invitationToken) {
      const ws = await acceptInvitation({ token: invitationToken, userId: user.id, email: user.email, ip: address });
      next = `/w/${ws.slug}`;
    } else if (input.workspaceName) {
      const ws = await createWorkspace({ name: input.workspaceName, ownerId: user.id, actor: user.email, ip: address });
      next = `/w/${ws.slug}`;
    }
    return { ok: true, data: { next } };
  } catch (err) {
    return toActionState(err);
  }
}

/** Always answers the same way, whether or not the address has an account. */
export async function requestPasswordResetAction(raw: unknown): Promise<ActionState> {
  try {
    await assertSameOrigin();
    const parsed = emailOnlySchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const email = normaliseEmail(parsed.data.email);
    await limitEmailSend('reset', email);
    const user = await getUserByEmail(email);
    if (user) {
      const token = await createResetToken(email);
      await sendMail(passwordResetMail(email, new URL(`/reset/${token}`, appUrl()).toString()));
      log.info({ event: 'password.reset_requested', userId: user.id }, 'reset link sent');
    }
    return { ok: true, message: 'If that address has an account, a reset link is on its way. It works once, within 30 minutes.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function resetPasswordAction(raw: unknown): Promise<ActionState> {
  try {
    await assertSameOrigin();
    const parsed = resetPasswordSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const outcome = await consumeResetToken(parsed.data.token, await hashPassword(parsed.data.password));
    if (outcome === 'invalid') throw badRequest('This reset link is not valid or was already used. Ask for a new one.');
    if (outcome === 'expired') throw badRequest('This reset link has expired. Ask for a new one.');
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
