import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso } from './client';
import { normaliseEmail, updateUserPassword } from './users';
import { createAuditEntry } from './audit';

/** Stores a single-use password-reset token by its hash. */
export async function insertResetToken(input: { email: string; tokenHash: string; expires: string }): Promise<void> {
  await db()('verification_tokens').insert({
    identifier: normaliseEmail(input.email),
    token: input.tokenHash,
    purpose: 'reset',
    expires: input.expires,
  });
}

/** The address a still-unused reset token (by its hash) belongs to, or null. */
export async function resetTokenEmailByHash(tokenHash: string): Promise<string | null> {
  const row = await db()('verification_tokens').where({ token: tokenHash, purpose: 'reset' }).first('identifier');
  return row ? String(row.identifier) : null;
}

export type ResetOutcome = 'ok' | 'invalid' | 'expired';

/** Consumes the token (by its hash) and sets the new password; old sessions and every other outstanding link end. */
export async function consumeResetTokenHash(
  trx: Knex.Transaction,
  tokenHash: string,
  passwordHash: string,
): Promise<ResetOutcome> {
  const row = await trx('verification_tokens').where({ token: tokenHash, purpose: 'reset' }).first();
  if (!row) return 'invalid';
  await trx('verification_tokens').where({ identifier: row.identifier, token: row.token, purpose: 'reset' }).delete();
  if (row.expires <= nowIso()) return 'expired';
  // updateUserPassword below also ends every other reset and sign-in link of the address.
  const user = await trx('users').where({ email: row.identifier }).first();
  if (!user) return 'invalid';
  await updateUserPassword(Number(user.id), passwordHash, trx);
  await createAuditEntry({ userId: Number(user.id), actor: user.email, action: 'password.reset' }, trx);
  return 'ok';
}
