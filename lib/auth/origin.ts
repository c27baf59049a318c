import 'server-only';
import { forbidden } from '@/lib/errors';
import { isAllowedOrigin } from './origin-check';

export { isAllowedOrigin };

/** Server actions: refuse a cross-site post. */
export async function assertSameOrigin(): Promise<void> {
  const { headers } = await import('next/headers');
  const h = await headers();
  if (!isAllowedOrigin(h.get('origin'), h.get('host'))) {
    throw forbidden('This request came from another site and was refused.');
  }
}
