import { TEST_ORIGIN } from './test-db';

/**
 * Stands in for `next/headers` when a test calls a server action directly: outside a Next.js request
 * there are no request headers to read, so the test sets them here (session cookie, Origin) and the
 * action's own checks run unchanged on them. Use with
 * `vi.mock('next/headers', () => import('../../support/next-request'))`.
 */
let current = new Headers({ host: new URL(TEST_ORIGIN).host });

export function setActionRequest(opts: { cookie?: string; origin?: string | null }): void {
  const h = new Headers({ host: new URL(TEST_ORIGIN).host });
  if (opts.cookie) h.set('cookie', opts.cookie);
  if (opts.origin !== null) h.set('origin', opts.origin ?? TEST_ORIGIN);
  current = h;
}

export async function headers(): Promise<Headers> {
  return current;
}

export async function cookies(): Promise<{ get: (name: string) => { name: string; value: string } | undefined }> {
  const jar = new Map<string, string>();
  for (const part of (current.get('cookie') ?? '').split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0) jar.set(part.slice(0, eq).trim(), part.slice(eq + 1).trim());
  }
  return { get: (name) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined) };
}
