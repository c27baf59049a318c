import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

/** A URL-safe random secret (sign-in links, invitations, API keys). */
export function randomToken(bytes = 32): string {
  return randomBytes(bytes).toString('base64url');
}

/** Secrets are stored only as their SHA-256. */
export function sha256Hex(value: string): string {
  return createHash('sha256').update(value).digest('hex');
}

export function safeEqualHex(a: string, b: string): boolean {
  const ab = Buffer.from(a, 'hex');
  const bb = Buffer.from(b, 'hex');
  return ab.length === bb.length && timingSafeEqual(ab, bb);
}

export const API_KEY_PREFIX = 'tpk_';

export function newApiKey(): { key: string; prefix: string; hash: string } {
  const key = `${API_KEY_PREFIX}${randomToken(30)}`;
  return { key, prefix: key.slice(0, 10), hash: sha256Hex(key) };
}
