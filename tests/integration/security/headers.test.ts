import { afterEach, describe, expect, it, vi } from 'vitest';
import { createRequire } from 'node:module';
import path from 'node:path';
import { NextRequest } from 'next/server';
import { config as proxyConfig, proxy } from '@/proxy';
import { resetEnvForTests } from '@/lib/env';
import { contentSecurityPolicy, hasSessionCookie, wantsHsts } from '@/lib/security/headers';

const saved = { ...process.env };

function withEnv(vars: Record<string, string>): void {
  Object.assign(process.env, { NEXTAUTH_SECRET: 'headers-test-secret-0123456789', ...vars });
  resetEnvForTests();
}

afterEach(() => {
  for (const k of Object.keys(process.env)) if (!(k in saved)) delete process.env[k];
  Object.assign(process.env, saved);
  resetEnvForTests();
});

const req = (path: string, headers: Record<string, string> = {}) =>
  new NextRequest(new URL(path, 'http://127.0.0.1:3000'), { headers });

describe('proxy security headers', () => {
  it('a fresh CSP nonce per request, passed on to the renderer in the request headers', () => {
    withEnv({ NEXTAUTH_URL: 'http://127.0.0.1:3000' });
    const a = proxy(req('/signin'));
    const b = proxy(req('/signin'));
    const csp = a.headers.get('content-security-policy') ?? '';
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1];
    expect(nonce).toMatch(/^[A-Za-z0-9+/]{22}==$/);
    expect(b.headers.get('content-security-policy')).not.toBe(csp);
    // NextResponse.next({ request: { headers } }) hands overridden request headers to the renderer this way.
    expect(a.headers.get('x-middleware-request-x-nonce')).toBe(nonce);
    expect(a.headers.get('x-middleware-request-content-security-policy')).toBe(csp);
    for (const d of [
      "default-src 'self'",
      "object-src 'none'",
      "base-uri 'none'",
      "frame-ancestors 'none'",
      "form-action 'self'",
      "img-src 'self' data: blob:",
      "style-src 'self' 'unsafe-inline'",
      "connect-src 'self'",
    ]) {
      expect(csp).toContain(d);
    }
    expect(csp).toContain(`script-src 'self' 'nonce-${nonce}' 'strict-dynamic'`);
    expect(csp).not.toContain('unsafe-eval');
    expect(a.headers.get('x-content-type-options')).toBe('nosniff');
    expect(a.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
  });

  it("development adds only 'unsafe-eval' for React's tooling", () => {
    expect(contentSecurityPolicy('n', { development: true })).toContain("'unsafe-eval'");
    expect(contentSecurityPolicy('n')).not.toContain("'unsafe-eval'");
  });

  it('Cache-Control: no-store on /api/v1, /w and on anything with a session cookie', () => {
    withEnv({ NEXTAUTH_URL: 'http://127.0.0.1:3000' });
    expect(proxy(req('/api/v1/workspaces')).headers.get('cache-control')).toBe('no-store');
    expect(proxy(req('/w/skarn-polar/screen')).headers.get('cache-control')).toBe('no-store');
    expect(proxy(req('/signin')).headers.get('cache-control')).toBeNull();
    expect(proxy(req('/', { cookie: 'next-auth.session-token=abc' })).headers.get('cache-control')).toBe('no-store');
    expect(
      proxy(req('/account', { cookie: '__Secure-next-auth.session-token.0=abc' })).headers.get('cache-control'),
    ).toBe('no-store');
    expect(hasSessionCookie(['next-auth.csrf-token', 'theme'])).toBe(false);
  });

  it('HSTS only in production over https', () => {
    withEnv({ NEXTAUTH_URL: 'http://127.0.0.1:3000', NODE_ENV: 'production' });
    expect(proxy(req('/signin')).headers.get('strict-transport-security')).toBeNull();
    withEnv({ NEXTAUTH_URL: 'https://tropopass.example', NODE_ENV: 'production' });
    expect(proxy(req('/signin')).headers.get('strict-transport-security')).toMatch(/^max-age=\d{7,}/);
    withEnv({ NEXTAUTH_URL: 'https://tropopass.example', NODE_ENV: 'test' });
    expect(proxy(req('/signin')).headers.get('strict-transport-security')).toBeNull();
    expect(wantsHsts('production', 'http://10.0.0.1', 'https')).toBe(true);
  });
});

describe('which paths the proxy runs for', () => {
  // Next.js compiles a matcher string as a path regular expression anchored at both ends.
  const matches = (path: string) => proxyConfig.matcher.some((m) => new RegExp(`^${m}$`).test(path));
  it.each(['/', '/signin', '/w/skarn-polar/screen', '/api/auth/session', '/api/auth/callback/credentials', '/account'])(
    'runs for %s',
    (p) => expect(matches(p)).toBe(true),
  );
  it.each([
    '/_next/static/chunks/a.js',
    '/icon.svg',
    '/api/v1/workspaces',
    '/api/v1/workspaces/x/screenings/preview',
    '/api/health',
    '/api/webhooks/stripe',
  ])('skips %s', (p) => expect(matches(p)).toBe(false));
});

describe('session cookie options (next-auth defaults, not overridden)', () => {
  it.each([
    ['http://127.0.0.1:3000', false, 'next-auth.session-token'],
    ['https://tropopass.example', true, '__Secure-next-auth.session-token'],
  ])('%s: HttpOnly, SameSite=Lax, Secure=%s', async (url, secure, name) => {
    withEnv({ NEXTAUTH_URL: url });
    vi.resetModules();
    const { authOptions } = await import('@/lib/auth/options');
    const opts = authOptions();
    expect(opts.useSecureCookies).toBe(secure);
    expect(opts.cookies).toBeUndefined();
    // next-auth 4 applies these when `cookies` is not overridden (core/lib/cookie.js, not in its exports map).
    const { defaultCookies } = createRequire(import.meta.url)(
      path.resolve('node_modules/next-auth/core/lib/cookie.js'),
    ) as { defaultCookies: (secure: boolean) => Record<string, { name: string; options: Record<string, unknown> }> };
    const session = defaultCookies(opts.useSecureCookies ?? false).sessionToken;
    expect(session.name).toBe(name);
    expect(session.options).toMatchObject({ httpOnly: true, sameSite: 'lax', secure, path: '/' });
    expect(opts.session?.maxAge).toBeLessThanOrEqual(24 * 3600);
  });
});
