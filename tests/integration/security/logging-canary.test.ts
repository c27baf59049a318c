import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { attemptSignIn, forgetLimiters } from './signin';
import { FLIGHT } from './fixtures';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as keysRoute from '@/app/api/v1/workspaces/[slug]/api-keys/route';
import * as workspacesRoute from '@/app/api/v1/workspaces/route';
import { revokeApiKey } from '@/db/api-keys';
import { createApiKey } from '@/lib/auth/api-keys';
import { createUser } from '@/db/users';
import { consumeResetToken, createResetToken } from '@/lib/auth/password-reset';
import { hashPassword } from '@/lib/auth/password';
import { log, onLogLine } from '@/lib/log';
import { sendMail } from '@/lib/mail/mailer';
import { passwordResetMail } from '@/lib/mail/templates';
import { authOptions } from '@/lib/auth/options';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { freePort } from '../../support/free-port';

const smtpPort = await freePort();
const httpPort = await freePort();
useTestDatabase({ SMTP_PORT: String(smtpPort), RATE_LIMIT_SIGNIN_PER_15MIN: '100' });

const lines: string[] = [];
let stop: () => void = () => undefined;
let smtp: SmtpFake;

beforeAll(async () => {
  forgetLimiters();
  smtp = await startSmtpFake({ smtpPort, httpPort });
  log.level = 'trace';
  stop = onLogLine((l) => lines.push(l));
});
afterAll(async () => {
  stop();
  log.level = 'silent';
  await smtp.close();
});

const PASSWORD = 'canary-pw-Zq8vR2mT5xK1';
const logged = () => lines.join('');

describe('no password, session token, API key or reset token reaches the logs', () => {
  it('runs the flows, sees their log events, and finds none of the secrets', async () => {
    const email = `canary-${Date.now()}@example.test`;
    const user = await createUser({ email, name: 'Canary', passwordHash: await hashPassword(PASSWORD) });
    const ws = await makeWorkspace(['viewer']);
    const other = await makeWorkspace();

    // Passwords: a wrong one (the canary with a suffix), the right one, and one that fails validation.
    expect((await attemptSignIn(email, `${PASSWORD}-wrong`)).ok).toBe(false);
    expect(await attemptSignIn(email, PASSWORD)).toEqual({ ok: true });
    expect((await attemptSignIn('not-an-email', PASSWORD)).ok).toBe(false);
    await authOptions().events?.signIn?.({
      user: { id: String(user.id), email },
      account: { provider: 'credentials', type: 'credentials', providerAccountId: String(user.id) },
      isNewUser: false,
    });

    // Session tokens: accepted, refused for the role, outside the workspace, in a bad request, and a forged one.
    const cookie = await sessionCookie(ws.owner.id);
    const viewerCookie = await sessionCookie(ws.members.viewer.id);
    const tokens = [cookie, viewerCookie].map((c) => c.split('=')[1]);
    const url = `/api/v1/workspaces/${ws.slug}/screenings`;
    expect(
      (await call(screeningsRoute.POST, apiRequest('POST', url, { cookie, body: FLIGHT }), { slug: ws.slug })).status,
    ).toBe(201);
    expect(
      (
        await call(screeningsRoute.POST, apiRequest('POST', url, { cookie, body: { ...FLIGHT, fuelBurnKg: -1 } }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(422);
    expect(
      (
        await call(screeningsRoute.POST, apiRequest('POST', url, { cookie: viewerCookie, body: FLIGHT }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await call(screeningsRoute.GET, apiRequest('GET', `/api/v1/workspaces/${other.slug}/screenings`, { cookie }), {
          slug: other.slug,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(
          screeningsRoute.POST,
          apiRequest('POST', url, { cookie, origin: 'https://evil.example', body: FLIGHT }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(403);
    const forged = 'canary-session-token-9fK2pQ';
    expect(
      (
        await call(
          workspacesRoute.GET,
          apiRequest('GET', '/api/v1/workspaces', { cookie: `next-auth.session-token=${forged}` }),
        )
      ).status,
    ).toBe(401);

    // API keys: created (shown once), used, used elsewhere, revoked, and unknown.
    const created = await call<{ id: number; key: string }>(
      keysRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/api-keys`, { cookie, body: { name: 'canary' } }),
      { slug: ws.slug },
    );
    expect(created.status).toBe(201);
    const key = created.body.key;
    expect(
      (
        await call(screeningsRoute.POST, apiRequest('POST', url, { bearer: key, body: { ...FLIGHT, month: 13 } }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(422);
    expect(
      (
        await call(
          screeningsRoute.GET,
          apiRequest('GET', `/api/v1/workspaces/${other.slug}/screenings`, { bearer: key }),
          { slug: other.slug },
        )
      ).status,
    ).toBe(404);
    const viewerKey = await createApiKey(
      { workspaceId: ws.id },
      { name: 'canary-viewer', role: 'viewer', createdBy: ws.owner.id, actor: 't' },
    );
    expect(
      (
        await call(screeningsRoute.POST, apiRequest('POST', url, { bearer: viewerKey.key, body: FLIGHT }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(403);
    await revokeApiKey({ workspaceId: ws.id }, { id: created.body.id, actorId: ws.owner.id, actor: 't' });
    expect((await call(screeningsRoute.GET, apiRequest('GET', url, { bearer: key }), { slug: ws.slug })).status).toBe(
      401,
    );
    const unknownKey = 'tpk_canaryUnknownKey0123456789abcdef';
    expect(
      (await call(screeningsRoute.GET, apiRequest('GET', url, { bearer: unknownKey }), { slug: ws.slug })).status,
    ).toBe(401);

    // Reset tokens: mailed, consumed, and replayed.
    const resetToken = await createResetToken(email);
    await sendMail(passwordResetMail(email, `http://127.0.0.1:3999/reset/${resetToken}`));
    expect(smtp.messages().some((m) => m.text.includes(resetToken))).toBe(true);
    expect(await consumeResetToken(resetToken, await hashPassword('another-password-123'))).toBe('ok');
    expect(await consumeResetToken(resetToken, await hashPassword('another-password-456'))).toBe('invalid');

    // Objects that carry secrets under the usual names are redacted wherever someone logs them.
    log.info(
      {
        password: PASSWORD,
        headers: { authorization: `Bearer ${viewerKey.key}`, cookie },
        body: { token: resetToken },
      },
      'careless log line',
    );

    await new Promise((r) => setTimeout(r, 50));
    const text = logged();
    for (const event of [
      'signin.failed',
      'signin.ok',
      'input.rejected',
      'authz.denied',
      'authz.not_member',
      'csrf.refused',
      'auth.rejected',
      'mail sent',
      'careless log line',
    ]) {
      expect(text, `expected log event ${event}`).toContain(event);
    }
    const secrets = {
      password: PASSWORD,
      forged,
      key,
      viewerKey: viewerKey.key,
      unknownKey,
      resetToken,
      ...Object.fromEntries(tokens.map((t, i) => [`session${i}`, t])),
    };
    for (const [name, secret] of Object.entries(secrets))
      expect(text.includes(secret), `${name} appeared in the logs`).toBe(false);
    expect(text).toContain('[redacted]');
  });
});
