import { afterEach, describe, expect, it, vi } from 'vitest';
import { NextRequest } from 'next/server';
import { proxy } from '@/proxy';
import { resetEnvForTests } from '@/lib/env';
import { authOptions } from '@/lib/auth/options';
import { isAllowedOrigin } from '@/lib/auth/origin-check';
import { resolveAfterSignIn, workspacePageOf } from '@/lib/auth/landing';

vi.mock('server-only', () => ({}));

const saved = { ...process.env };
function withEnv(vars: Record<string, string>): void {
  Object.assign(process.env, { NEXTAUTH_SECRET: 'redirects-test-secret-0123456789', ...vars });
  resetEnvForTests();
}
afterEach(() => {
  for (const k of Object.keys(process.env)) if (!(k in saved)) delete process.env[k];
  Object.assign(process.env, saved);
  resetEnvForTests();
});

const APP = 'http://127.0.0.1:3000';
const req = (path: string, init: { method?: string; headers?: Record<string, string> } = {}) =>
  new NextRequest(new URL(path, APP), init);

const FOREIGN = [
  '//evil.example/',
  '/\\evil.example/',
  '/\t/evil.example',
  '/%09/evil.example',
  '/%2F%2Fevil.example',
  '/%5Cevil.example',
  'https://evil.example/',
];

describe('sign-in callback', () => {
  it.each(FOREIGN)('the proxy drops the foreign callback %j before the sign-in page sees it', (cb) => {
    withEnv({ NEXTAUTH_URL: APP });
    const res = proxy(req(`/signin?callbackUrl=${encodeURIComponent(cb)}&error=Verification`));
    expect(res.status).toBe(303);
    const to = new URL(res.headers.get('location') ?? '');
    expect(to.origin).toBe(APP);
    expect(to.pathname).toBe('/signin');
    expect(to.searchParams.has('callbackUrl')).toBe(false);
    expect(to.searchParams.get('error')).toBe('Verification');
  });

  it('an unparsable callback is dropped too, not a 500', () => {
    withEnv({ NEXTAUTH_URL: APP });
    expect(proxy(req('/signin?callbackUrl=%E0%A4%A')).status).toBe(303);
  });

  it('a same-origin deep link passes, and pages learn the whole path and query asked for', () => {
    withEnv({ NEXTAUTH_URL: APP });
    const cb = '/w/skarn-polar/fleets?from=2026-10-01';
    expect(proxy(req(`/signin?callbackUrl=${encodeURIComponent(cb)}`)).status).toBe(200);
    const page = proxy(req(cb));
    expect(page.headers.get('x-middleware-request-x-tropopass-return-to')).toBe(cb);
    expect(proxy(req(`${cb}&_rsc=abc12`)).headers.get('x-middleware-request-x-tropopass-return-to')).toBe(cb);
    expect(page.headers.get('x-middleware-request-x-tropopass-document')).toBe('1');
    expect(proxy(req(cb, { headers: { rsc: '1' } })).headers.get('x-middleware-request-x-tropopass-document')).toBe(
      '0',
    );
    // A client cannot choose it: the proxy writes its own.
    const forged = proxy(req('/w/skarn-polar', { headers: { 'x-tropopass-return-to': '//evil.example/' } }));
    expect(forged.headers.get('x-middleware-request-x-tropopass-return-to')).toBe('/w/skarn-polar');
  });

  it.each(FOREIGN)("next-auth's redirect callback sends %j to the app instead", async (cb) => {
    withEnv({ NEXTAUTH_URL: APP });
    const redirect = authOptions().callbacks?.redirect;
    if (!redirect) throw new Error('no redirect callback');
    expect(new URL(await redirect({ url: cb, baseUrl: APP })).origin).toBe(APP);
    expect(await redirect({ url: `${APP}/w/a/fleets?from=2026-10-01`, baseUrl: APP })).toBe(
      `${APP}/w/a/fleets?from=2026-10-01`,
    );
  });
});

describe('role-aware landing after sign-in', () => {
  const finance = [{ workspace: { slug: 'skarn-polar' }, role: 'billing' as const }];
  const planner = [{ workspace: { slug: 'skarn-polar' }, role: 'planner' as const }];
  it('a callback the role cannot see goes to the role landing with a notice', () => {
    expect(resolveAfterSignIn('/w/skarn-polar/fleets?from=2026-10-01', finance)).toBe(
      '/w/skarn-polar/settings/billing?notice=outside-role',
    );
    expect(resolveAfterSignIn('/w/skarn-polar', finance)).toBe('/w/skarn-polar/settings/billing?notice=outside-role');
    expect(resolveAfterSignIn('/w/skarn-polar/settings/members', planner)).toBe('/w/skarn-polar?notice=outside-role');
  });
  it('a callback the role can see is kept whole', () => {
    expect(resolveAfterSignIn('/w/skarn-polar/fleets?from=2026-10-01', planner)).toBe(
      '/w/skarn-polar/fleets?from=2026-10-01',
    );
    expect(resolveAfterSignIn('/w/skarn-polar/settings/billing', finance)).toBe('/w/skarn-polar/settings/billing');
    expect(resolveAfterSignIn(null, finance)).toBe('/w/skarn-polar/settings/billing');
  });
  it("the page table matches every workspace page's own permission check", async () => {
    const fs = await import('node:fs');
    const path = await import('node:path');
    const root = path.join(process.cwd(), 'app/(app)/w/[slug]');
    const pages = fs.readdirSync(root, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('page.tsx'));
    expect(pages.length).toBeGreaterThan(10);
    for (const f of pages) {
      const src = fs.readFileSync(path.join(root, f), 'utf8');
      const asked = /(?:requireMember\(slug|libraryMember\(params), '([a-z:]+)'\)/.exec(src)?.[1];
      const dir = path.dirname(f) === '.' ? '' : path.dirname(f).replace(/\[[^\]]+\]/g, 'x');
      expect(workspacePageOf(`/w/s/${dir}`)?.permission, f).toBe(asked);
    }
  });
});

describe('origin check', () => {
  it('needs the app scheme as well as its host', () => {
    withEnv({ NEXTAUTH_URL: 'https://app.example' });
    expect(isAllowedOrigin('https://app.example', 'app.example')).toBe(true);
    expect(isAllowedOrigin('http://app.example', 'app.example')).toBe(false);
  });

  it('a cross-site server action gets a 403 from the proxy, whatever X-Forwarded-Host claims', async () => {
    withEnv({ NEXTAUTH_URL: APP });
    const res = proxy(
      req('/w/skarn-polar/settings/api-keys', {
        method: 'POST',
        headers: {
          'next-action': 'abc',
          origin: 'https://evil.example',
          host: '127.0.0.1:3000',
          'x-forwarded-host': 'evil.example',
        },
      }),
    );
    expect(res.status).toBe(403);
    expect((await res.json()).error.code).toBe('forbidden');
    const same = proxy(
      req('/w/skarn-polar/settings/api-keys', {
        method: 'POST',
        headers: { 'next-action': 'abc', origin: APP, host: '127.0.0.1:3000' },
      }),
    );
    expect(same.status).toBe(200);
  });
});
