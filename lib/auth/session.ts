import 'server-only';
import { decode } from 'next-auth/jwt';
import { env, isHttpsApp } from '@/lib/env';
import { getUserById, type UserDto } from '@/db/users';
import { isSessionLive } from '@/db/sessions';

export type SessionUser = UserDto;

export function sessionCookieName(): string {
  return isHttpsApp() ? '__Secure-next-auth.session-token' : 'next-auth.session-token';
}

/** Reads the session token from a cookie header, joining next-auth's chunks (`name.0`, `name.1`) if any. */
export function sessionTokenFromCookies(get: (name: string) => string | undefined): string | undefined {
  const name = sessionCookieName();
  const whole = get(name);
  if (whole) return whole;
  let joined = '';
  for (let i = 0; ; i++) {
    const part = get(`${name}.${i}`);
    if (!part) break;
    joined += part;
  }
  return joined || undefined;
}

export function parseCookieHeader(header: string | null): Map<string, string> {
  const out = new Map<string, string>();
  if (!header) return out;
  for (const piece of header.split(';')) {
    const i = piece.indexOf('=');
    if (i < 0) continue;
    const k = piece.slice(0, i).trim();
    const v = piece.slice(i + 1).trim();
    if (k && !out.has(k)) {
      try {
        out.set(k, decodeURIComponent(v));
      } catch {
        out.set(k, v);
      }
    }
  }
  return out;
}

/**
 * The user behind a session token, checked against the database on every call: the account must
 * still exist, its session version must match (sign-out everywhere, password change, removal),
 * the session must be younger than the absolute lifetime whatever next-auth's sliding expiry says, and
 * its recorded row must still be live (sign-out revokes it). A token without a session id is refused.
 */
export async function userFromSessionToken(token: string | undefined): Promise<SessionUser | null> {
  if (!token) return null;
  let payload: Record<string, unknown> | null;
  try {
    payload = await decode({ token, secret: env().NEXTAUTH_SECRET });
  } catch {
    return null;
  }
  if (!payload) return null;
  const uid = Number(payload.uid);
  const sv = Number(payload.sv);
  const authAt = Number(payload.authAt);
  const sid = payload.sid;
  if (!Number.isInteger(uid) || !Number.isFinite(authAt) || typeof sid !== 'string' || !sid) return null;
  if (Date.now() - authAt > env().SESSION_MAX_HOURS * 3_600_000) return null;
  const user = await getUserById(uid);
  if (!user || user.sessionVersion !== sv) return null;
  if (!(await isSessionLive(sid, uid))) return null;
  return user;
}

/** The recorded session id inside a token, whatever its state; null when the token does not decode. */
export async function sessionIdFromToken(token: string | undefined): Promise<string | null> {
  if (!token) return null;
  try {
    const payload = await decode({ token, secret: env().NEXTAUTH_SECRET });
    return payload && typeof payload.sid === 'string' ? payload.sid : null;
  } catch {
    return null;
  }
}

export async function userFromRequest(req: Request): Promise<SessionUser | null> {
  const cookies = parseCookieHeader(req.headers.get('cookie'));
  return userFromSessionToken(sessionTokenFromCookies((n) => cookies.get(n)));
}

/** For server components and actions. */
export async function currentUser(): Promise<SessionUser | null> {
  const { cookies } = await import('next/headers');
  const jar = await cookies();
  return userFromSessionToken(sessionTokenFromCookies((n) => jar.get(n)?.value));
}
