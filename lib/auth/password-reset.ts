import 'server-only';
import { writeTx } from '@/db/client';
import { consumeResetTokenHash, insertResetToken, resetTokenEmailByHash, type ResetOutcome } from '@/db/reset-tokens';
import { randomToken, sha256Hex } from './tokens';

/** How long a reset link works. */
export const RESET_MINUTES = 30;

/** A single-use password-reset token; only its hash is stored. */
export async function createResetToken(email: string): Promise<string> {
  const token = randomToken();
  await insertResetToken({
    email,
    tokenHash: sha256Hex(token),
    expires: new Date(Date.now() + RESET_MINUTES * 60_000).toISOString(),
  });
  return token;
}

/** The address a still-unused reset token belongs to (to judge the new password against it), or null. */
export function resetTokenEmail(token: string): Promise<string | null> {
  return resetTokenEmailByHash(sha256Hex(token));
}

/** Consumes the token and sets the new password in one transaction; old sessions and every other outstanding link end. */
export function consumeResetToken(token: string, passwordHash: string): Promise<ResetOutcome> {
  return writeTx((trx) => consumeResetTokenHash(trx, sha256Hex(token), passwordHash));
}
