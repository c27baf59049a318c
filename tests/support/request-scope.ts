/**
 * Server actions and pages read the request through `next/headers`, which only exists inside a Next
 * server. Integration tests that call them directly replace that module with this scope:
 * `vi.mock('next/headers', async () => (await import('../../support/request-scope')).nextHeaders)`,
 * then set `scope.cookie` / `scope.headers` per call. Cookies an action sets are kept in `scope.setCookies`.
 */
import { TEST_ORIGIN } from './test-db';

export const scope: { cookie: string; headers: Record<string, string>; setCookies: Map<string, string> } = {
  cookie: '',
  headers: {},
  setCookies: new Map(),
};

export function resetScope(
  cookie = '',
  headers: Record<string, string> = { origin: TEST_ORIGIN, host: new URL(TEST_ORIGIN).host },
): void {
  scope.cookie = cookie;
  scope.headers = headers;
  scope.setCookies = new Map();
}

function cookieMap(): Map<string, string> {
  const out = new Map<string, string>();
  for (const piece of scope.cookie.split(';')) {
    const i = piece.indexOf('=');
    if (i > 0) out.set(piece.slice(0, i).trim(), piece.slice(i + 1).trim());
  }
  for (const [k, v] of scope.setCookies) out.set(k, v);
  return out;
}

export const nextHeaders = {
  headers: async () => new Headers({ ...scope.headers, cookie: scope.cookie }),
  cookies: async () => ({
    get: (name: string) => {
      const v = cookieMap().get(name);
      return v === undefined ? undefined : { name, value: v };
    },
    getAll: () => [...cookieMap()].map(([name, value]) => ({ name, value })),
    has: (name: string) => cookieMap().has(name),
    set: (name: string, value: string) => {
      scope.setCookies.set(name, value);
    },
    delete: (name: string) => {
      scope.setCookies.delete(name);
    },
  }),
};
