import 'server-only';
import { createHash, randomBytes } from 'node:crypto';
import { appUrl, env } from '@/lib/env';
import { knexAdapter } from './adapter';

/**
 * A sign-in link exactly as next-auth's e-mail provider makes one (random token, stored as the SHA-256
 * of token + secret, consumed by /api/auth/callback/email), for mails the app sends itself.
 */
export async function createSignInLink(email: string, callbackPath: string, minutes: number): Promise<string> {
  const token = randomBytes(32).toString('hex');
  await knexAdapter().createVerificationToken?.({
    identifier: email,
    token: createHash('sha256').update(`${token}${env().NEXTAUTH_SECRET}`).digest('hex'),
    expires: new Date(Date.now() + minutes * 60_000),
  });
  const url = new URL('/api/auth/callback/email', appUrl());
  url.search = new URLSearchParams({
    callbackUrl: new URL(callbackPath, appUrl()).toString(),
    token,
    email,
  }).toString();
  return url.toString();
}
