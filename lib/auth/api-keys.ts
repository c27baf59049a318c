import 'server-only';
import { writeTx } from '@/db/client';
import { findApiKeyByHash, insertApiKey, type ApiKeyDto, type ApiKeyPrincipal } from '@/db/api-keys';
import { can, ROLES, type Role } from './policy';
import { newApiKey, sha256Hex } from './tokens';

/** Roles whose holders may make keys: a key lives only while its creator still holds one of them here. */
const KEY_MAKER_ROLES = ROLES.filter((r) => can(r, 'apikeys:manage'));

/** Creates a key; the plain key is returned once and only its hash is kept. */
export async function createApiKey(
  scope: { workspaceId: number },
  input: { name: string; role: Role; createdBy: number; actor: string; ip?: string | null },
): Promise<ApiKeyDto & { key: string }> {
  const { key, prefix, hash } = newApiKey();
  const dto = await writeTx((trx) => insertApiKey(trx, scope, { ...input, prefix, hash }));
  return { ...dto, key };
}

/**
 * Resolves a presented key to its workspace and role; revoked or unknown keys give null, and so does a
 * key whose creator has left the workspace or no longer holds the permission that made it.
 */
export function findApiKey(key: string): Promise<ApiKeyPrincipal | null> {
  return findApiKeyByHash(sha256Hex(key), KEY_MAKER_ROLES);
}
