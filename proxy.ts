import { NextResponse, type NextRequest } from 'next/server';
import { appUrl, env } from '@/lib/env';
import { DOCUMENT_HEADER, RETURN_TO_HEADER, safeCallbackPath } from '@/lib/auth/callback';
import { isAllowedOrigin } from '@/lib/auth/origin-check';
import {
  baseSecurityHeaders,
  contentSecurityPolicy,
  createNonce,
  hasSessionCookie,
  mustNotStore,
  wantsHsts,
} from '@/lib/security/headers';

/**
 * Security headers on every response, and a per-request CSP nonce that Next.js applies to its own
 * scripts (it reads the nonce back from the request's Content-Security-Policy header). This is not an
 * access gate: pages, handlers and actions check the session and the role themselves.
 */
export function proxy(request: NextRequest): NextResponse {
  const e = env();
  const { pathname } = request.nextUrl;
  // A cross-site server action is refused here with a 403 in the usual error shape; left to the
  // framework it would end as a 500.
  if (
    request.method === 'POST' &&
    request.headers.has('next-action') &&
    !isAllowedOrigin(request.headers.get('origin'), request.headers.get('host'))
  ) {
    return NextResponse.json(
      { error: { code: 'forbidden', message: 'This request came from another site and was refused.' } },
      { status: 403 },
    );
  }
  // A foreign or malformed callback never reaches the sign-in page: it is dropped here.
  if (pathname === '/signin' && request.nextUrl.searchParams.has('callbackUrl')) {
    const raw = request.nextUrl.searchParams.get('callbackUrl');
    if (!safeCallbackPath(raw, appUrl())) {
      const clean = new URL('/signin', appUrl());
      for (const [k, v] of request.nextUrl.searchParams) if (k !== 'callbackUrl') clean.searchParams.append(k, v);
      return NextResponse.redirect(clean, 303);
    }
  }
  const nonce = createNonce();
  const csp = contentSecurityPolicy(nonce, { development: e.NODE_ENV === 'development' });

  const requestHeaders = new Headers(request.headers);
  requestHeaders.set('x-nonce', nonce);
  requestHeaders.set('content-security-policy', csp);
  // Pages read this to send a signed-out visitor to sign-in and back to the very same path and query.
  requestHeaders.set(RETURN_TO_HEADER, returnTo(pathname, request.nextUrl.searchParams));
  const isDocument = request.method === 'GET' && !request.headers.has('rsc') && !request.headers.has('next-action');
  requestHeaders.set(DOCUMENT_HEADER, isDocument ? '1' : '0');

  const res = NextResponse.next({ request: { headers: requestHeaders } });
  res.headers.set('content-security-policy', csp);
  const hsts = wantsHsts(e.NODE_ENV, e.NEXTAUTH_URL, request.headers.get('x-forwarded-proto'));
  for (const [k, v] of Object.entries(baseSecurityHeaders({ hsts }))) res.headers.set(k, v);
  const signedIn = hasSessionCookie(request.cookies.getAll().map((c) => c.name));
  if (mustNotStore(request.nextUrl.pathname, signedIn)) res.headers.set('cache-control', 'no-store');
  return res;
}

/** The page asked for, without the framework's own cache-busting parameter on client navigations. */
function returnTo(pathname: string, params: URLSearchParams): string {
  const kept = new URLSearchParams(params);
  kept.delete('_rsc');
  const query = kept.toString();
  return query ? `${pathname}?${query}` : pathname;
}

export const config = {
  // Static build assets carry no session data and need no nonce; the JSON API, health and webhook
  // routes get fixed headers from next.config.mjs instead (no HTML, so no nonce to hand out).
  matcher: ['/((?!_next/static|_next/image|icon.svg|api/v1/|api/v1$|api/health|api/webhooks/).*)'],
};
