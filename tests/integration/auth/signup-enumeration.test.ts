import net from 'node:net';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { makeUser, useTestDatabase } from '../../support/test-db';
import { resetScope, scope } from '../../support/request-scope';
import { signUpAction } from '@/app/(auth)/actions';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { db } from '@/db/client';

vi.mock('next/headers', async () => (await import('../../support/request-scope')).nextHeaders);

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const a = s.address();
      s.close(() => resolve(typeof a === 'object' && a ? a.port : 0));
    });
  });
}

const smtpPort = await freePort();
const httpPort = await freePort();
useTestDatabase({ SMTP_PORT: String(smtpPort), RATE_LIMIT_EMAIL_PER_HOUR: '100' });
let smtp: SmtpFake;
beforeAll(async () => {
  smtp = await startSmtpFake({ smtpPort, httpPort });
});
afterAll(async () => smtp?.close());
beforeEach(() => resetScope());

function form(values: Record<string, string>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, v);
  return f;
}

async function outcome(p: Promise<unknown>): Promise<{ redirect?: string; state?: unknown; cookies: string[] }> {
  try {
    return { state: await p, cookies: [...scope.setCookies.keys()] };
  } catch (err) {
    return {
      redirect: String((err as { digest?: string }).digest).split(';')[2],
      cookies: [...scope.setCookies.keys()],
    };
  }
}

describe('sign-up does not tell whether an address has an account', () => {
  it('answers the same for a taken and a free address; the owner of the taken one is mailed, the new one gets a confirmation link', async () => {
    const taken = await makeUser('taken');
    const free = `free-${Date.now()}@operator.example`;
    const a = await outcome(
      signUpAction(null, form({ name: 'Someone', email: taken.email, password: 'stratus-lantern-41' })),
    );
    resetScope();
    const b = await outcome(signUpAction(null, form({ name: 'Someone', email: free, password: 'stratus-lantern-41' })));
    expect(a).toEqual({ redirect: '/signup/check-email', cookies: [] });
    expect(b).toEqual({ redirect: '/signup/check-email', cookies: [] });

    const toTaken = smtp.messages().filter((m) => m.to.includes(taken.email));
    expect(toTaken.map((m) => m.subject)).toEqual(['Someone tried to create a Tropopass account with your address']);
    const toFree = smtp.messages().filter((m) => m.to.includes(free));
    expect(toFree.map((m) => m.subject)).toEqual(['Finish creating your Tropopass account']);
    expect(toFree[0].text).toMatch(/\/api\/auth\/callback\/email\?callbackUrl=/);
    expect(await db()('users').where({ email: free }).first()).toBeDefined();
    expect(await db()('users').where({ email: taken.email }).select('id')).toHaveLength(1);
  });
});
