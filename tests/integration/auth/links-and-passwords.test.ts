import { beforeEach, describe, expect, it, vi } from 'vitest';
import { makeUser, sessionCookie, useTestDatabase } from '../../support/test-db';
import { resetScope, scope } from '../../support/request-scope';
import { createResetToken, consumeResetToken, resetTokenEmail } from '@/lib/auth/password-reset';
import { bumpSessionVersion, createUser, getCredentialsByEmail } from '@/db/users';
import { knexAdapter } from '@/lib/auth/adapter';
import { hashPassword, verifyPassword } from '@/lib/auth/password';
import { userFromSessionToken } from '@/lib/auth/session';
import { resetPasswordAction, signInWithPasswordAction, signUpAction } from '@/app/(auth)/actions';
import { db } from '@/db/client';

vi.mock('next/headers', async () => (await import('../../support/request-scope')).nextHeaders);

useTestDatabase({ RATE_LIMIT_EMAIL_PER_HOUR: '100' });
beforeEach(() => resetScope());

function form(values: Record<string, string>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, v);
  return f;
}

async function redirectOf(p: Promise<unknown>): Promise<string> {
  try {
    const state = await p;
    return `(no redirect: ${JSON.stringify(state)})`;
  } catch (err) {
    return String((err as { digest?: string }).digest ?? err).split(';')[2] ?? String(err);
  }
}

async function signInLink(email: string, token: string): Promise<void> {
  await knexAdapter().createVerificationToken?.({ identifier: email, token, expires: new Date(Date.now() + 600_000) });
}

describe('outstanding links end together', () => {
  it('a reset ends every other reset link and every sign-in link of the address', async () => {
    const u = await makeUser('resetter');
    const a = await createResetToken(u.email);
    const b = await createResetToken(u.email);
    await signInLink(u.email, 'signin-link-hash-1');
    expect(await consumeResetToken(a, await hashPassword('stratus-lantern-41'))).toBe('ok');
    expect(await resetTokenEmail(b)).toBeNull();
    expect(await consumeResetToken(b, await hashPassword('someone-else-7Q'))).toBe('invalid');
    expect(await knexAdapter().useVerificationToken?.({ identifier: u.email, token: 'signin-link-hash-1' })).toBeNull();
    const creds = await getCredentialsByEmail(u.email);
    expect(await verifyPassword(creds?.passwordHash ?? null, 'stratus-lantern-41')).toBe(true);
  });

  it('sign-out everywhere ends outstanding reset and sign-in links as well as sessions', async () => {
    const u = await makeUser('everywhere');
    const token = await createResetToken(u.email);
    await signInLink(u.email, 'signin-link-hash-2');
    const cookie = await sessionCookie(u.id);
    await bumpSessionVersion(u.id);
    expect(await consumeResetToken(token, await hashPassword('stratus-lantern-41'))).toBe('invalid');
    expect(await knexAdapter().useVerificationToken?.({ identifier: u.email, token: 'signin-link-hash-2' })).toBeNull();
    expect(await userFromSessionToken(cookie.split('=')[1])).toBeNull();
    expect(await db()('auth_sessions').where({ user_id: u.id }).whereNull('revoked_at').first()).toBeUndefined();
  });
});

describe('the password rule on the forms', () => {
  it.each(['aaaaaaaaaa', 'password12', '1234567890', 'tropopass-demo'])(
    'sign-up refuses %j with the reason on the password field',
    async (password) => {
      const email = `weak-${Math.random().toString(36).slice(2)}@operator.example`;
      const state = await signUpAction(null, form({ name: 'Ola Weak', email, password }));
      expect(state).toMatchObject({ ok: false, error: { code: 'invalid_fields', fields: [{ path: 'password' }] } });
      expect(await db()('users').where({ email }).first()).toBeUndefined();
    },
  );

  it('a reset refuses a weak password and keeps the link usable', async () => {
    const u = await makeUser('weakreset');
    const token = await createResetToken(u.email);
    const state = await resetPasswordAction(null, form({ token, password: 'qwertyuiop', confirm: 'qwertyuiop' }));
    expect(state).toMatchObject({ ok: false, error: { fields: [{ path: 'password' }] } });
    expect(await resetTokenEmail(token)).toBe(u.email);
    expect(
      await redirectOf(
        resetPasswordAction(null, form({ token, password: 'stratus-lantern-41', confirm: 'stratus-lantern-41' })),
      ),
    ).toBe('/signin?reset=1');
  });

  it('the demo password still works for a seeded demo account', async () => {
    await createUser({
      email: 'planner@tropopass.test',
      name: 'Demo Planner',
      passwordHash: await hashPassword('old-demo-pass-9Q'),
    });
    const token = await createResetToken('planner@tropopass.test');
    expect(
      await redirectOf(
        resetPasswordAction(null, form({ token, password: 'tropopass-demo', confirm: 'tropopass-demo' })),
      ),
    ).toBe('/signin?reset=1');
  });
});

describe('password sign-in as a form post', () => {
  it('sets a recorded session cookie and goes on through the landing with the deep link kept', async () => {
    const email = `poster-${Date.now()}@operator.example`;
    const u = await createUser({ email, name: 'Poster', passwordHash: await hashPassword('stratus-lantern-41') });
    const to = await redirectOf(
      signInWithPasswordAction(
        null,
        form({ email, password: 'stratus-lantern-41', callbackUrl: '/w/skarn-polar/fleets?from=2026-10-01' }),
      ),
    );
    expect(to).toBe(`/start?next=${encodeURIComponent('/w/skarn-polar/fleets?from=2026-10-01')}`);
    const cookie = scope.setCookies.get('next-auth.session-token');
    expect((await userFromSessionToken(cookie))?.id).toBe(u.id);
  });

  it('a foreign callback is not followed, and a wrong password gives the message without echoing the password', async () => {
    const email = `poster2-${Date.now()}@operator.example`;
    await createUser({ email, name: 'Poster', passwordHash: await hashPassword('stratus-lantern-41') });
    expect(
      await redirectOf(
        signInWithPasswordAction(null, form({ email, password: 'stratus-lantern-41', callbackUrl: '//evil.example/' })),
      ),
    ).toBe('/start');
    resetScope();
    const state = await signInWithPasswordAction(null, form({ email, password: 'not-the-password' }));
    expect(state).toMatchObject({ ok: false, values: { email } });
    expect(JSON.stringify(state)).not.toContain('not-the-password');
  });
});
