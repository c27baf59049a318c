import 'server-only';
import type { Adapter, AdapterUser, VerificationToken } from 'next-auth/adapters';
import { db } from '@/db/client';
import { getUserByEmail, getUserById, markEmailVerified, normaliseEmail, type UserDto } from '@/db/users';

const toAdapterUser = (u: UserDto): AdapterUser => ({
  id: String(u.id),
  email: u.email,
  name: u.name,
  emailVerified: u.emailVerifiedAt ? new Date(u.emailVerifiedAt) : null,
});

/**
 * The part of next-auth's adapter interface that its e-mail provider calls under the JWT strategy.
 * Sign-in links are only for existing accounts: `createUser` refuses, and the `signIn` callback
 * turns unknown addresses away before a link is sent.
 */
export function knexAdapter(): Adapter {
  return {
    async createUser() {
      throw new Error('Accounts are created by signing up or accepting an invitation.');
    },
    async getUser(id) {
      const u = await getUserById(Number(id));
      return u ? toAdapterUser(u) : null;
    },
    async getUserByEmail(email) {
      const u = await getUserByEmail(email);
      return u ? toAdapterUser(u) : null;
    },
    async getUserByAccount() {
      return null;
    },
    async updateUser(user) {
      if (user.emailVerified) await markEmailVerified(Number(user.id));
      const u = await getUserById(Number(user.id));
      if (!u) throw new Error('No such user');
      return toAdapterUser(u);
    },
    async linkAccount() {
      return undefined;
    },
    async createVerificationToken(token: VerificationToken) {
      await db()('verification_tokens').insert({
        identifier: normaliseEmail(token.identifier),
        token: token.token,
        purpose: 'signin',
        expires: token.expires.toISOString(),
      });
      return token;
    },
    async useVerificationToken({ identifier, token }) {
      // Delete-then-return makes the link single use even when two requests race.
      const row = await db()('verification_tokens')
        .where({ identifier: normaliseEmail(identifier), token, purpose: 'signin' })
        .first();
      if (!row) return null;
      const deleted = await db()('verification_tokens')
        .where({ identifier: row.identifier, token: row.token, purpose: 'signin' })
        .delete();
      if (!deleted) return null;
      return { identifier: row.identifier, token: row.token, expires: new Date(row.expires) };
    },
  };
}
