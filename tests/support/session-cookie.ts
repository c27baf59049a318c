import { randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import { encode } from 'next-auth/jwt';

/**
 * The session cookie of `email` as a real sign-in makes it: a live row of auth_sessions (sign-out
 * revokes it) and the next-auth token naming it, signed with `secret` (the app's NEXTAUTH_SECRET).
 */
export async function sessionCookie(k: Knex, email: string, secret: string): Promise<string> {
  const user = (await k('users').where({ email }).first()) as { id: number; session_version: number };
  const sid = randomBytes(24).toString('base64url');
  await k('auth_sessions').insert({
    id: sid,
    user_id: user.id,
    created_at: new Date().toISOString(),
    expires_at: new Date(Date.now() + 12 * 3_600_000).toISOString(),
    revoked_at: null,
  });
  const token = await encode({
    token: { uid: user.id, sv: Number(user.session_version), authAt: Date.now(), sid },
    secret,
  });
  return `next-auth.session-token=${token}`;
}
