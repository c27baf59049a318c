import 'server-only';
import { appUrl } from '@/lib/env';
import { forbidden } from '@/lib/errors';

/** True when an Origin header is absent (non-browser client) or names this app. */
export function isAllowedOrigin(origin: string | null, host: string | null): boolean {
  if (!origin) return true;
  let o: URL;
  try {
    o = new URL(origin);
  } catch {
    return false;
  }
  if (o.origin === appUrl().origin) return true;
  return !!host && o.host === host;
}

/** Server actions: refuse a cross-site post. */
export async function assertSameOrigin(): Promise<void> {
  const { headers } = await import('next/headers');
  const h = await headers();
  if (!isAllowedOrigin(h.get('origin'), h.get('x-forwarded-host') ?? h.get('host'))) {
    throw forbidden('This request came from another site and was refused.');
  }
}
