import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso } from './client';
import { randomBytes } from 'node:crypto';

/** Records a new session for the user and returns its id (carried in the session token). */
export async function createSession(
  userId: number,
  lifetimeHours: number,
  trx: Knex | Knex.Transaction = db(),
): Promise<string> {
  const id = randomBytes(24).toString('base64url');
  await trx('auth_sessions').insert({
    id,
    user_id: userId,
    created_at: nowIso(),
    expires_at: new Date(Date.now() + lifetimeHours * 3_600_000).toISOString(),
    revoked_at: null,
  });
  return id;
}

/** True while the session exists for this user, is not revoked and has not expired. */
export async function isSessionLive(id: string, userId: number): Promise<boolean> {
  const row = await db()('auth_sessions').where({ id, user_id: userId }).whereNull('revoked_at').first('expires_at');
  return !!row && String(row.expires_at) > nowIso();
}

export async function revokeSession(id: string): Promise<void> {
  await db()('auth_sessions').where({ id }).whereNull('revoked_at').update({ revoked_at: nowIso() });
}

export async function revokeAllSessions(userId: number, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx('auth_sessions').where({ user_id: userId }).whereNull('revoked_at').update({ revoked_at: nowIso() });
}
