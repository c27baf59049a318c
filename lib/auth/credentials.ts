import 'server-only';
import { encode } from 'next-auth/jwt';
import { env, isHttpsApp } from '@/lib/env';
import { verifyPassword } from './password';
import { getCredentialsByEmail, getUserById, normaliseEmail, type UserDto } from '@/db/users';
import { createAuditEntry } from '@/db/audit';
import { createSession } from '@/db/sessions';
import { assertSignInAllowed, recordSignInFailure, recordSignInSuccess, SignInLockedError } from './throttle';
import { sessionCookieName } from './session';
import { log } from '@/lib/log';

export const WRONG_CREDENTIALS = 'That e-mail and password do not match an account.';

/** The password check shared by next-auth's credentials provider and the sign-in form's server action. */
export async function checkCredentials(
  rawEmail: string,
  password: string,
  ip: string,
): Promise<{ ok: true; user: UserDto } | { ok: false; message: string }> {
  const email = normaliseEmail(rawEmail);
  try {
    await assertSignInAllowed(email, ip);
  } catch (err) {
    if (err instanceof SignInLockedError) {
      log.warn({ event: 'signin.locked', email, ip }, 'sign-in refused: locked');
      return { ok: false, message: err.message };
    }
    throw err;
  }
  const found = await getCredentialsByEmail(email);
  const ok = await verifyPassword(found?.passwordHash ?? null, password);
  if (!found || !ok) {
    await recordSignInFailure(email, ip);
    log.warn({ event: 'signin.failed', email, ip }, 'sign-in failed');
    await createAuditEntry({ userId: found?.user.id ?? null, actor: email, action: 'signin.failed', ip });
    return { ok: false, message: WRONG_CREDENTIALS };
  }
  await recordSignInSuccess(email);
  return { ok: true, user: found.user };
}

/** The claims every session token carries; `sid` names the recorded session that sign-out revokes. */
export async function sessionClaims(
  userId: number,
): Promise<{ uid: number; sv: number; authAt: number; sid: string } | null> {
  const u = await getUserById(userId);
  if (!u) return null;
  const sid = await createSession(u.id, env().SESSION_MAX_HOURS);
  return { uid: u.id, sv: u.sessionVersion, authAt: Date.now(), sid };
}

/**
 * Signs the user in from a server action: records the session and sets the same cookie next-auth's
 * JWT strategy would, so pages, handlers and next-auth's own session endpoint all read it.
 */
export async function startSessionFromAction(user: UserDto, method: string, ip: string): Promise<void> {
  const claims = await sessionClaims(user.id);
  if (!claims) throw new Error('The account disappeared while signing in.');
  const maxAge = env().SESSION_MAX_HOURS * 3600;
  const token = await encode({
    token: { name: user.name, email: user.email, sub: String(user.id), ...claims },
    secret: env().NEXTAUTH_SECRET,
    maxAge,
  });
  const { cookies } = await import('next/headers');
  (await cookies()).set(sessionCookieName(), token, {
    httpOnly: true,
    sameSite: 'lax',
    path: '/',
    secure: isHttpsApp(),
    maxAge,
  });
  log.info({ event: 'signin.ok', userId: user.id, method }, 'signed in');
  await createAuditEntry({ userId: user.id, actor: user.email, action: 'signin', detail: { method }, ip });
}
