import 'server-only';
import { db, nowIso, writeTx } from './client';
import { randomToken, sha256Hex } from '@/lib/auth/tokens';
import { normaliseEmail, updateUserPassword } from './users';
import { createAuditEntry } from './audit';

export const RESET_MINUTES = 30;

/** A single-use password-reset token; only its hash is stored. */
export async function createResetToken(email: string): Promise<string> {
  const token = randomToken();
  await db()('verification_tokens').insert({
    identifier: normaliseEmail(email),
    token: sha256Hex(token),
    purpose: 'reset',
    expires: new Date(Date.now() + RESET_MINUTES * 60_000).toISOString(),
  });
  return token;
}

/** The address a still-unused reset token belongs to (to judge the new password against it), or null. */
export async function resetTokenEmail(token: string): Promise<string | null> {
  const row = await db()('verification_tokens')
    .where({ token: sha256Hex(token), purpose: 'reset' })
    .first('identifier');
  return row ? String(row.identifier) : null;
}

export type ResetOutcome = 'ok' | 'invalid' | 'expired';

/** Consumes the token and sets the new password in one transaction; old sessions and every other outstanding link end. */
export async function consumeResetToken(token: string, passwordHash: string): Promise<ResetOutcome> {
  return writeTx(async (trx) => {
    const row = await trx('verification_tokens')
      .where({ token: sha256Hex(token), purpose: 'reset' })
      .first();
    if (!row) return 'invalid';
    await trx('verification_tokens').where({ identifier: row.identifier, token: row.token, purpose: 'reset' }).delete();
    if (row.expires <= nowIso()) return 'expired';
    // updateUserPassword below also ends every other reset and sign-in link of the address.
    const user = await trx('users').where({ email: row.identifier }).first();
    if (!user) return 'invalid';
    await updateUserPassword(Number(user.id), passwordHash, trx);
    await createAuditEntry({ userId: Number(user.id), actor: user.email, action: 'password.reset' }, trx);
    return 'ok';
  });
}
