import { appUrl } from '@/lib/env';

/**
 * True when an Origin header is absent (non-browser client) or names this app: its own origin, or the
 * request's Host under the app's own scheme (a plain-http page may not post to an https app). The Host
 * header is the one the server received; `X-Forwarded-Host` is written by the client and never consulted.
 */
export function isAllowedOrigin(origin: string | null, host: string | null): boolean {
  if (!origin) return true;
  let o: URL;
  try {
    o = new URL(origin);
  } catch {
    return false;
  }
  const app = appUrl();
  if (o.origin === app.origin) return true;
  return !!host && o.protocol === app.protocol && o.host === host;
}
