import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import { isRole, type Role } from '@/lib/auth/roles';
import { notFound } from '@/lib/errors';

export interface ApiKeyDto {
  id: number;
  name: string;
  role: Role;
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
}

const toDto = (r: Record<string, unknown>): ApiKeyDto => ({
  id: Number(r.id),
  name: String(r.name),
  role: isRole(r.role) ? r.role : 'viewer',
  prefix: String(r.key_prefix),
  createdAt: String(r.created_at),
  lastUsedAt: (r.last_used_at as string | null) ?? null,
});

/** Stores a new key by its prefix and hash (the plain key is never stored), and audits it. */
export async function insertApiKey(
  trx: Knex.Transaction,
  scope: { workspaceId: number },
  input: {
    name: string;
    role: Role;
    prefix: string;
    hash: string;
    createdBy: number;
    actor: string;
    ip?: string | null;
  },
): Promise<ApiKeyDto> {
  const { prefix, hash } = input;
  const now = nowIso();
  const id = await insertId(
    trx('api_keys')
      .insert({
        workspace_id: scope.workspaceId,
        name: input.name.trim(),
        role: input.role,
        key_prefix: prefix,
        key_hash: hash,
        created_by: input.createdBy,
        created_at: now,
      })
      .returning('id'),
  );
  await createAuditEntry(
    {
      workspaceId: scope.workspaceId,
      userId: input.createdBy,
      actor: input.actor,
      action: 'apikey.created',
      target: `${input.name} (${prefix}…)`,
      detail: { role: input.role },
      ip: input.ip,
    },
    trx,
  );
  return { id, name: input.name.trim(), role: input.role, prefix, createdAt: now, lastUsedAt: null };
}

export async function listApiKeys(scope: { workspaceId: number }): Promise<ApiKeyDto[]> {
  const rows = await db()('api_keys').where({ workspace_id: scope.workspaceId }).whereNull('revoked_at').orderBy('id');
  return rows.map(toDto);
}

export async function revokeApiKey(
  scope: { workspaceId: number },
  input: { id: number; actorId: number | null; actor: string; ip?: string | null },
): Promise<void> {
  await writeTx(async (trx) => {
    const r = await trx('api_keys')
      .where({ workspace_id: scope.workspaceId, id: input.id })
      .whereNull('revoked_at')
      .first();
    if (!r) throw notFound('No active API key with that id in this workspace.');
    await trx('api_keys').where({ id: r.id }).update({ revoked_at: nowIso() });
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.actorId,
        actor: input.actor,
        action: 'apikey.revoked',
        target: `${r.name} (${r.key_prefix}…)`,
        ip: input.ip,
      },
      trx,
    );
  });
}

export interface ApiKeyPrincipal {
  keyId: number;
  keyName: string;
  role: Role;
  workspace: { id: number; slug: string; name: string };
}

const lastTouched = new Map<number, number>();

/**
 * Resolves a key's hash to its workspace and role; revoked or unknown keys give null, and so does a
 * key whose creator has left the workspace or no longer holds one of `makerRoles`.
 */
export async function findApiKeyByHash(keyHash: string, makerRoles: readonly Role[]): Promise<ApiKeyPrincipal | null> {
  const r = await db()('api_keys as k')
    .join('workspaces as w', 'w.id', 'k.workspace_id')
    .join('memberships as m', function () {
      this.on('m.workspace_id', '=', 'k.workspace_id').andOn('m.user_id', '=', 'k.created_by');
    })
    .whereIn('m.role', makerRoles)
    .where('k.key_hash', keyHash)
    .whereNull('k.revoked_at')
    .select('k.id', 'k.name', 'k.role', 'w.id as wid', 'w.slug', 'w.name as wname')
    .first();
  if (!r || !isRole(r.role)) return null;
  const id = Number(r.id);
  // Record use at most once a minute per key, so reads under load do not each become a write.
  const now = Date.now();
  if ((lastTouched.get(id) ?? 0) < now - 60_000) {
    lastTouched.set(id, now);
    await db()('api_keys')
      .where({ id })
      .update({ last_used_at: new Date(now).toISOString() });
  }
  return { keyId: id, keyName: r.name, role: r.role, workspace: { id: Number(r.wid), slug: r.slug, name: r.wname } };
}
