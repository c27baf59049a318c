import { beforeAll, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { attemptSignIn, forgetLimiters } from './signin';
import { FLIGHT } from './fixtures';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as previewRoute from '@/app/api/v1/workspaces/[slug]/screenings/preview/route';
import { createUser } from '@/db/users';
import { hashPassword } from '@/lib/auth/password';
import { limitEmailSend } from '@/lib/auth/throttle';
import { authOptions } from '@/lib/auth/options';
import { AppError } from '@/lib/errors';
import { db } from '@/db/client';

useTestDatabase({
  TRUSTED_PROXY_HOPS: '1',
  RATE_LIMIT_SIGNIN_PER_15MIN: '3',
  RATE_LIMIT_API_PER_MIN: '25',
  RATE_LIMIT_PREVIEW_PER_MIN: '4',
  RATE_LIMIT_EMAIL_PER_HOUR: '2',
});

const PASSWORD = 'correct horse battery';

beforeAll(() => forgetLimiters());

async function account(name: string): Promise<string> {
  const email = `${name}-${Date.now()}@example.test`;
  await createUser({ email, name, passwordHash: await hashPassword(PASSWORD) });
  return email;
}

describe('sign-in throttling', () => {
  it('soft-locks an account after the limit, with a clear message, even for the right password; a restart does not reset it', async () => {
    const email = await account('locked');
    expect(await attemptSignIn(email, PASSWORD, '10.1.0.1')).toEqual({ ok: true });
    for (let i = 0; i < 3; i++) {
      const r = await attemptSignIn(email, 'wrong password', `10.1.0.${10 + i}`);
      expect(r).toEqual({ ok: false, message: 'That e-mail and password do not match an account.' });
    }
    const locked = await attemptSignIn(email, PASSWORD, '10.1.0.99');
    expect(locked.ok).toBe(false);
    expect(locked.ok ? '' : locked.message).toMatch(
      /Too many failed sign-ins\. Sign-in is paused for about \d+ minutes?/,
    );
    forgetLimiters();
    const afterRestart = await attemptSignIn(email, PASSWORD, '10.1.0.100');
    expect(afterRestart.ok ? '' : afterRestart.message).toMatch(/Too many failed sign-ins/);
  });

  it('a success clears the account counter', async () => {
    const email = await account('clears');
    for (let round = 0; round < 3; round++) {
      expect((await attemptSignIn(email, 'nope', '10.2.0.1')).ok).toBe(false);
      expect((await attemptSignIn(email, 'nope', '10.2.0.1')).ok).toBe(false);
      expect(await attemptSignIn(email, PASSWORD, '10.2.0.1')).toEqual({ ok: true });
    }
  });

  it('locks an address that tries many accounts (5 x the per-account limit)', async () => {
    const ip = '10.3.0.1';
    for (let i = 0; i < 15; i++) expect((await attemptSignIn(`nobody-${i}@example.test`, 'guess', ip)).ok).toBe(false);
    const email = await account('innocent');
    const r = await attemptSignIn(email, PASSWORD, ip);
    expect(r.ok ? '' : r.message).toMatch(/Too many failed sign-ins/);
    expect(await attemptSignIn(email, PASSWORD, '10.3.0.2')).toEqual({ ok: true });
  });
});

describe('client address behind one trusted proxy', () => {
  it('is the address the proxy appended, not one the client wrote into X-Forwarded-For', async () => {
    const email = await account('spoofer');
    expect((await attemptSignIn(email, 'wrong', '6.6.6.6, 10.9.0.1')).ok).toBe(false);
    const row = await db()('audit_log').where({ actor: email, action: 'signin.failed' }).first();
    expect(row.ip).toBe('10.9.0.1');
  });
});

describe('API and preview throttling', () => {
  it('429 with Retry-After and a JSON error once the per-minute API limit is spent', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const url = `/api/v1/workspaces/${ws.slug}/screenings`;
    for (let i = 0; i < 25; i++)
      expect((await call(screeningsRoute.GET, apiRequest('GET', url, { cookie }), { slug: ws.slug })).status).toBe(200);
    const r = await call(screeningsRoute.GET, apiRequest('GET', url, { cookie }), { slug: ws.slug });
    expect(r.status).toBe(429);
    expect(r.body.error?.code).toBe('throttled');
    expect(Number(r.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
    expect(Number(r.headers.get('retry-after'))).toBeLessThanOrEqual(60);
  });

  it('previews have their own, lower limit', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const url = `/api/v1/workspaces/${ws.slug}/screenings/preview`;
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++)
      statuses.push(
        (await call(previewRoute.POST, apiRequest('POST', url, { cookie, body: FLIGHT }), { slug: ws.slug })).status,
      );
    expect(statuses).toEqual([200, 200, 200, 200, 429]);
  });
});

describe('e-mail throttling', () => {
  type SendVerification = (params: { identifier: string; url: string }) => Promise<void>;
  const sendSignInLink = (to: string): Promise<void> => {
    const provider = authOptions().providers.find((p) => p.id === 'email') as unknown as {
      options: { sendVerificationRequest: SendVerification };
    };
    return provider.options.sendVerificationRequest({
      identifier: to,
      url: 'http://127.0.0.1:3999/api/auth/callback/email?token=x',
    });
  };

  it('sign-in links to one address stop after the hourly limit (the e-mail provider refuses the third with the limit message)', async () => {
    // An address with no account: the provider sends no mail for it, but the request still counts.
    const to = `nobody-${Date.now()}@example.test`;
    await sendSignInLink(to);
    await sendSignInLink(to);
    await expect(sendSignInLink(to)).rejects.toThrow('Too many e-mails were requested for this address');
    await expect(sendSignInLink(`other-${to}`)).resolves.toBeUndefined();
  });

  it.each(['reset', 'invite'] as const)(
    '%s e-mails to one address stop after the hourly limit; another address and the other kinds keep their own count',
    async (kind) => {
      const to = `${kind}-${Date.now()}@example.test`;
      await limitEmailSend(kind, to);
      await limitEmailSend(kind, to);
      const err = await limitEmailSend(kind, to).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(AppError);
      expect((err as AppError).code).toBe('throttled');
      await expect(limitEmailSend(kind, `b-${to}`)).resolves.toBeUndefined();
      await expect(limitEmailSend(kind === 'reset' ? 'invite' : 'reset', to)).resolves.toBeUndefined();
    },
  );
});
