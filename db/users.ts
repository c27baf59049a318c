import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso } from './client';

import type { UnitSystem } from '@/lib/units';
export type { UnitSystem };

export interface UserDto {
  id: number;
  email: string;
  name: string;
  units: UnitSystem;
  sessionVersion: number;
  emailVerifiedAt: string | null;
}

interface UserRow {
  id: number;
  email: string;
  name: string;
  units: string;
  session_version: number;
  email_verified_at: string | null;
  password_hash: string | null;
}

const PUBLIC_COLUMNS = ['id', 'email', 'name', 'units', 'session_version', 'email_verified_at'];

function toDto(r: Omit<UserRow, 'password_hash'>): UserDto {
  return {
    id: Number(r.id),
    email: r.email,
    name: r.name,
    units: r.units === 'imperial' ? 'imperial' : 'metric',
    sessionVersion: Number(r.session_version),
    emailVerifiedAt: r.email_verified_at,
  };
}

export const normaliseEmail = (email: string): string => email.trim().toLowerCase();

export async function getUserById(id: number): Promise<UserDto | null> {
  const r = await db()('users').select(PUBLIC_COLUMNS).where({ id }).first();
  return r ? toDto(r) : null;
}

export async function getUserByEmail(email: string): Promise<UserDto | null> {
  const r = await db()('users')
    .select(PUBLIC_COLUMNS)
    .where({ email: normaliseEmail(email) })
    .first();
  return r ? toDto(r) : null;
}

/** The only reader of the password hash, for the credentials check. */
export async function getCredentialsByEmail(
  email: string,
): Promise<{ user: UserDto; passwordHash: string | null } | null> {
  const r = (await db()('users')
    .where({ email: normaliseEmail(email) })
    .first()) as UserRow | undefined;
  return r ? { user: toDto(r), passwordHash: r.password_hash } : null;
}

export async function createUser(
  input: { email: string; name: string; passwordHash: string | null; emailVerified?: boolean },
  trx: Knex | Knex.Transaction = db(),
): Promise<UserDto> {
  const now = nowIso();
  const id = await insertId(
    trx('users')
      .insert({
        email: normaliseEmail(input.email),
        name: input.name.trim(),
        password_hash: input.passwordHash,
        email_verified_at: input.emailVerified ? now : null,
        created_at: now,
        updated_at: now,
      })
      .returning('id'),
  );
  const r = await trx('users').select(PUBLIC_COLUMNS).where({ id }).first();
  return toDto(r);
}

/** Every reset and sign-in link still outstanding for the address stops working. */
export async function endOutstandingLinks(email: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx('verification_tokens')
    .where({ identifier: normaliseEmail(email) })
    .delete();
}

/**
 * A new password ends every existing session of the user (the session version moves on, the recorded
 * sessions are revoked) and every reset or sign-in link still outstanding.
 */
export async function updateUserPassword(userId: number, passwordHash: string, trx: Knex | Knex.Transaction = db()) {
  await trx('users')
    .where({ id: userId })
    .update({ password_hash: passwordHash, updated_at: nowIso() })
    .increment('session_version', 1);
  await endSessionsAndLinks(userId, trx);
}

/** Sign-out everywhere: every session and every outstanding reset or sign-in link ends. */
export async function bumpSessionVersion(userId: number, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx('users').where({ id: userId }).increment('session_version', 1).update({ updated_at: nowIso() });
  await endSessionsAndLinks(userId, trx);
}

async function endSessionsAndLinks(userId: number, trx: Knex | Knex.Transaction): Promise<void> {
  await trx('auth_sessions').where({ user_id: userId }).whereNull('revoked_at').update({ revoked_at: nowIso() });
  const row = await trx('users').where({ id: userId }).first('email');
  if (row) await endOutstandingLinks(String(row.email), trx);
}

export async function markEmailVerified(userId: number): Promise<void> {
  await db()('users').where({ id: userId }).whereNull('email_verified_at').update({ email_verified_at: nowIso() });
}

export async function updateUserProfile(userId: number, input: { name?: string; units?: UnitSystem }): Promise<void> {
  const patch: Record<string, unknown> = { updated_at: nowIso() };
  if (input.name !== undefined) patch.name = input.name.trim();
  if (input.units !== undefined) patch.units = input.units;
  await db()('users').where({ id: userId }).update(patch);
}
