/**
 * Response security headers, shared by `proxy.ts` and the tests that check them. No imports from
 * next or the database: the proxy runs before anything else on every request.
 */

/** A fresh nonce per request: 16 random bytes, base64 (CSP nonce-source syntax). */
export function createNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}

/**
 * The Content-Security-Policy for a page rendered with this nonce. Next.js reads the nonce back from
 * the request's own `Content-Security-Policy` header and puts it on every script it emits;
 * `'strict-dynamic'` lets those scripts load the app's chunks. Development needs `'unsafe-eval'` for
 * React's debugging tools; production never gets it.
 */
export function contentSecurityPolicy(nonce: string, opts: { development?: boolean } = {}): string {
  const script = ["'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...(opts.development ? ["'unsafe-eval'"] : [])];
  const directives: [string, string[]][] = [
    ['default-src', ["'self'"]],
    ['script-src', script],
    ['style-src', ["'self'", "'unsafe-inline'"]],
    ['img-src', ["'self'", 'data:', 'blob:']],
    ['font-src', ["'self'"]],
    ['connect-src', ["'self'", ...(opts.development ? ['ws:'] : [])]],
    ['object-src', ["'none'"]],
    ['base-uri', ["'none'"]],
    ['frame-ancestors', ["'none'"]],
    ['form-action', ["'self'"]],
  ];
  return directives.map(([name, values]) => `${name} ${values.join(' ')}`).join('; ');
}

export const HSTS_VALUE = 'max-age=31536000; includeSubDomains';

/** Headers every response carries, whatever its path. */
export function baseSecurityHeaders(opts: { hsts: boolean }): Record<string, string> {
  return {
    'x-content-type-options': 'nosniff',
    'referrer-policy': 'strict-origin-when-cross-origin',
    'x-frame-options': 'DENY',
    ...(opts.hsts ? { 'strict-transport-security': HSTS_VALUE } : {}),
  };
}

const SESSION_COOKIE = /^(__Secure-)?next-auth\.session-token(\.\d+)?$/;

/** True when a request carries a session cookie (whole or chunked), i.e. the response is for a signed-in user. */
export function hasSessionCookie(cookieNames: Iterable<string>): boolean {
  for (const name of cookieNames) if (SESSION_COOKIE.test(name)) return true;
  return false;
}

/** Responses that must never be stored by a browser or a shared cache. */
export function mustNotStore(pathname: string, signedIn: boolean): boolean {
  return (
    signedIn ||
    pathname === '/api/v1' ||
    pathname.startsWith('/api/v1/') ||
    pathname === '/w' ||
    pathname.startsWith('/w/')
  );
}

/** HSTS only for a production server reached over https: on plain http it would be ignored or, worse, pin a dev host. */
export function wantsHsts(nodeEnv: string | undefined, appUrl: string, forwardedProto: string | null): boolean {
  if (nodeEnv !== 'production') return false;
  let https = false;
  try {
    https = new URL(appUrl).protocol === 'https:';
  } catch {
    https = false;
  }
  return https || forwardedProto === 'https';
}
