import { env } from '@/lib/env';

/** Stands for "a client we cannot tell apart" when no trusted proxy names the address. */
export const UNKNOWN_CLIENT = 'direct';

/**
 * The client address for throttles and the audit log. `X-Forwarded-For` is written by whoever sends the
 * request, so it is read only when `TRUSTED_PROXY_HOPS` says how many proxies of ours sit in front:
 * the address is then the one those proxies appended, counted from the right, never the client's own.
 */
export function clientIpFrom(get: (name: string) => string | null | undefined): string {
  const hops = env().TRUSTED_PROXY_HOPS;
  if (hops <= 0) return UNKNOWN_CLIENT;
  const chain = (get('x-forwarded-for') ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  const candidate = chain[chain.length - hops];
  return candidate && /^[0-9a-fA-F.:]{2,45}$/.test(candidate) ? candidate : UNKNOWN_CLIENT;
}
