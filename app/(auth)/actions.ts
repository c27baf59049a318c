'use server';

import { headers } from 'next/headers';
import { redirect } from 'next/navigation';
import { signUpSchema, emailOnlySchema, resetPasswordSchema, signInSchema } from '@/lib/validation/auth';
import { conflict, fromZod, toActionState, type ActionState, badRequest, invalidFields } from '@/lib/errors';
import { hashPassword } from '@/lib/auth/password';
import { passwordProblem } from '@/lib/auth/password-rule';
import { createUser, getUserByEmail, normaliseEmail } from '@/db/users';
import { writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import { createWorkspace, acceptInvitation, getInvitationByToken } from '@/lib/workspaces/service';
import { createResetToken, consumeResetToken, resetTokenEmail } from '@/lib/auth/password-reset';
import { limitEmailSend } from '@/lib/auth/throttle';
import { sendMail } from '@/lib/mail/mailer';
import { passwordResetMail, signUpConfirmMail, signUpExistingMail } from '@/lib/mail/templates';
import { createSignInLink } from '@/lib/auth/email-link';
import { appUrl } from '@/lib/env';
import { assertSameOrigin } from '@/lib/auth/origin';
import { log } from '@/lib/log';
import { clientIpFrom } from '@/lib/auth/client-ip';
import { checkCredentials, startSessionFromAction } from '@/lib/auth/credentials';
import { safeCallbackPath } from '@/lib/auth/callback';
import { formText } from '@/lib/validation/action-input';

async function ip(): Promise<string> {
  const h = await headers();
  return clientIpFrom((n) => h.get(n));
}

/**
 * What a form posted by these actions gets back. Forms post with or without client script, so the
 * state carries the visible values to refill (never a password) beside the error.
 */
export type AuthFormState = (ActionState & { values?: Record<string, string> }) | null;

/** Text fields of a posted form; anything else (no form, files, repeated names) reads as absent. */
const text = formText;

/** The error state of a failed post, with the values to put back in the form. */
function failed(err: unknown, values?: Record<string, string>): AuthFormState {
  const state = toActionState(err);
  return state && !state.ok ? { ...state, values } : state;
}

function afterSignIn(callbackUrl: string | undefined): string {
  const back = safeCallbackPath(callbackUrl, appUrl());
  return back ? `/start?next=${encodeURIComponent(back)}` : '/start';
}

/** Password sign-in as a plain form post: works before the page's script loads, and the password never reaches a URL. */
export async function signInWithPasswordAction(_prev: AuthFormState, form: FormData | unknown): Promise<AuthFormState> {
  const email = text(form, 'email') ?? '';
  let next: string;
  try {
    await assertSameOrigin();
    const parsed = signInSchema.safeParse({ email, password: text(form, 'password') ?? '' });
    if (!parsed.success) throw fromZod(parsed.error);
    const address = await ip();
    const outcome = await checkCredentials(parsed.data.email, parsed.data.password, address);
    if (!outcome.ok) throw badRequest(outcome.message);
    await startSessionFromAction(outcome.user, 'credentials', address);
    next = afterSignIn(text(form, 'callbackUrl'));
  } catch (err) {
    return failed(err, { email });
  }
  redirect(next);
}

/** Refuses a weak password with the reason on the password field. */
function assertPasswordAllowed(password: string, ctx: { email: string; name?: string }): void {
  const problem = passwordProblem(password, ctx);
  if (problem) throw invalidFields([{ path: 'password', message: problem }], problem);
}

/**
 * Creates an account (and optionally a first workspace, or joins the invitation's workspace). Without an
 * invitation the answer is the same whether or not the address already has an account: a page asking to
 * check the mail, which holds either a link to confirm and sign in, or a note to the existing owner.
 */
export async function signUpAction(_prev: AuthFormState, form: FormData | unknown): Promise<AuthFormState> {
  const raw = {
    name: text(form, 'name') ?? '',
    email: text(form, 'email') ?? '',
    password: text(form, 'password') ?? '',
    workspaceName: text(form, 'workspaceName') ?? '',
  };
  const invitationToken = text(form, 'invitationToken') || undefined;
  const values = { name: raw.name, email: raw.email, workspaceName: raw.workspaceName };
  let next = '/start';
  try {
    await assertSameOrigin();
    const parsed = signUpSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const input = parsed.data;
    const email = normaliseEmail(input.email);
    assertPasswordAllowed(input.password, { email, name: input.name });
    let invitedEmail: string | undefined;
    if (invitationToken) {
      const inv = await getInvitationByToken(invitationToken);
      if (inv.state !== 'open') throw badRequest('This invitation can no longer be used; ask for a new one.');
      invitedEmail = inv.email;
      if (invitedEmail !== email) {
        throw conflict(`This invitation was sent to ${invitedEmail}.`, [
          { path: 'email', message: `Use the invited address, ${invitedEmail}.` },
        ]);
      }
    }
    if (!invitedEmail && (await getUserByEmail(email))) {
      // The page answers exactly as for a new account; the owner of the address is told by mail.
      await hashPassword(input.password);
      await mailExistingOwner(email);
      next = CHECK_EMAIL;
      throw SIGNED_UP;
    }
    if (invitedEmail && (await getUserByEmail(email))) {
      throw conflict('This address already has an account: sign in to accept the invitation.', [
        { path: 'email', message: 'This address already has an account. Sign in to accept the invitation.' },
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
        throw conflict('An account with this e-mail already exists.', [
          { path: 'email', message: 'An account with this e-mail already exists.' },
        ]);
      }
      throw err;
    });
    next = '/start';
    if (invitationToken) {
      const ws = await acceptInvitation({ token: invitationToken, userId: user.id, email: user.email, ip: address });
      next = `/w/${ws.slug}`;
    } else if (input.workspaceName) {
      const ws = await createWorkspace({ name: input.workspaceName, ownerId: user.id, actor: user.email, ip: address });
      next = `/w/${ws.slug}`;
    }
    if (invitedEmail) {
      // The invitation came by mail to this address, so it is already confirmed: sign in at once.
      await startSessionFromAction(user, 'signup', address);
    } else {
      await sendMail(signUpConfirmMail(email, await createSignInLink(email, afterSignIn(next), SIGN_UP_LINK_MINUTES)));
      next = CHECK_EMAIL;
    }
  } catch (err) {
    if (err !== SIGNED_UP) return failed(err, values);
  }
  redirect(next);
}

const CHECK_EMAIL = '/signup/check-email';
const SIGN_UP_LINK_MINUTES = 60;
/** Ends the sign-up early with the same answer as a new account. */
const SIGNED_UP = Symbol('signed-up');

async function mailExistingOwner(email: string): Promise<void> {
  try {
    await limitEmailSend('signin', email);
  } catch {
    return;
  }
  await sendMail(
    signUpExistingMail(email, new URL('/signin', appUrl()).toString(), new URL('/reset', appUrl()).toString()),
  );
}

/** Always answers the same way, whether or not the address has an account. */
export async function requestPasswordResetAction(
  _prev: AuthFormState,
  form: FormData | unknown,
): Promise<AuthFormState> {
  const email = text(form, 'email') ?? '';
  try {
    await assertSameOrigin();
    const parsed = emailOnlySchema.safeParse({ email });
    if (!parsed.success) throw fromZod(parsed.error);
    const address = normaliseEmail(parsed.data.email);
    await limitEmailSend('reset', address);
    const user = await getUserByEmail(address);
    if (user) {
      const token = await createResetToken(address);
      await sendMail(passwordResetMail(address, new URL(`/reset/${token}`, appUrl()).toString()));
      log.info({ event: 'password.reset_requested', userId: user.id }, 'reset link sent');
    }
    return {
      ok: true,
      message: 'If that address has an account, a reset link is on its way. It works once, within 30 minutes.',
    };
  } catch (err) {
    return failed(err, { email });
  }
}

export async function resetPasswordAction(_prev: AuthFormState, form: FormData | unknown): Promise<AuthFormState> {
  try {
    await assertSameOrigin();
    const parsed = resetPasswordSchema.safeParse({
      token: text(form, 'token') ?? '',
      password: text(form, 'password') ?? '',
      confirm: text(form, 'confirm') ?? '',
    });
    if (!parsed.success) throw fromZod(parsed.error);
    const email = await resetTokenEmail(parsed.data.token);
    if (email) {
      const account = await getUserByEmail(email);
      assertPasswordAllowed(parsed.data.password, { email, name: account?.name });
    }
    const outcome = await consumeResetToken(parsed.data.token, await hashPassword(parsed.data.password));
    if (outcome === 'invalid') throw badRequest('This reset link is not valid or was already used. Ask for a new one.');
    if (outcome === 'expired') throw badRequest('This reset link has expired. Ask for a new one.');
  } catch (err) {
    return failed(err);
  }
  redirect('/signin?reset=1');
}
