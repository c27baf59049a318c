import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import { isRole, type Role } from '@/lib/auth/roles';
import { conflict, notFound } from '@/lib/errors';
import { normaliseEmail } from './users';

export interface WorkspaceDto {
  id: number;
  slug: string;
  name: string;
  createdAt: string;
}

export interface MembershipDto {
  workspace: WorkspaceDto;
  role: Role;
}

const wsDto = (r: { id: number; slug: string; name: string; created_at: string }): WorkspaceDto => ({
  id: Number(r.id),
  slug: r.slug,
  name: r.name,
  createdAt: r.created_at,
});

function roleOf(value: unknown): Role {
  if (!isRole(value)) throw new Error(`Unknown role in database: ${String(value)}`);
  return value;
}

export async function listWorkspacesForUser(scope: { userId: number }): Promise<MembershipDto[]> {
  const rows = await db()('memberships as m')
    .join('workspaces as w', 'w.id', 'm.workspace_id')
    .where('m.user_id', scope.userId)
    .select('w.id', 'w.slug', 'w.name', 'w.created_at', 'm.role')
    .orderBy('w.name');
  return rows.map((r) => ({ workspace: wsDto(r), role: roleOf(r.role) }));
}

/** The caller's membership of the workspace with this slug, or null (not a member or no such workspace). */
export async function getMembership(scope: { userId: number; slug: string }): Promise<MembershipDto | null> {
  const r = await db()('memberships as m')
    .join('workspaces as w', 'w.id', 'm.workspace_id')
    .where({ 'm.user_id': scope.userId, 'w.slug': scope.slug })
    .select('w.id', 'w.slug', 'w.name', 'w.created_at', 'm.role')
    .first();
  return r ? { workspace: wsDto(r), role: roleOf(r.role) } : null;
}

export async function getWorkspaceById(id: number, trx: Knex | Knex.Transaction = db()): Promise<WorkspaceDto | null> {
  const r = await trx('workspaces').where({ id }).first();
  return r ? wsDto(r) : null;
}

export async function getWorkspaceBySlug(slug: string): Promise<WorkspaceDto | null> {
  const r = await db()('workspaces').where({ slug }).first();
  return r ? wsDto(r) : null;
}

export function slugify(name: string): string {
  const base = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40);
  return base.length >= 2 ? base : `workspace-${base}`.replace(/-+$/, '');
}

/** Inserts the workspace (its slug free, or made from the name and numbered) with its owner, and audits it. */
export async function insertWorkspace(
  trx: Knex.Transaction,
  input: { name: string; slug?: string; ownerId: number; actor?: string; ip?: string | null },
): Promise<WorkspaceDto> {
  let slug = input.slug ?? slugify(input.name);
  if (input.slug) {
    if (await trx('workspaces').where({ slug }).first()) {
      throw conflict('That address is taken; choose another.', [
        { path: 'slug', message: 'This address is already in use.' },
      ]);
    }
  } else {
    const base = slug;
    for (let n = 2; await trx('workspaces').where({ slug }).first(); n++) slug = `${base}-${n}`;
  }
  const now = nowIso();
  const id = await insertId(
    trx('workspaces')
      .insert({ slug, name: input.name.trim(), created_by: input.ownerId, created_at: now })
      .returning('id'),
  );
  await trx('memberships').insert({ workspace_id: id, user_id: input.ownerId, role: 'owner', created_at: now });
  const ws: WorkspaceDto = { id, slug, name: input.name.trim(), createdAt: now };
  await createAuditEntry(
    {
      workspaceId: id,
      userId: input.ownerId,
      actor: input.actor,
      action: 'workspace.created',
      target: slug,
      ip: input.ip,
    },
    trx,
  );
  return ws;
}

export interface MemberDto {
  userId: number;
  email: string;
  name: string;
  role: Role;
  joinedAt: string;
}

export async function listMembers(scope: { workspaceId: number }): Promise<MemberDto[]> {
  const rows = await db()('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where('m.workspace_id', scope.workspaceId)
    .select('u.id', 'u.email', 'u.name', 'm.role', 'm.created_at')
    .orderBy('u.email');
  return rows.map((r) => ({
    userId: Number(r.id),
    email: r.email,
    name: r.name,
    role: roleOf(r.role),
    joinedAt: r.created_at,
  }));
}

async function ownerCount(trx: Knex.Transaction, workspaceId: number): Promise<number> {
  const r = await trx('memberships')
    .where({ workspace_id: workspaceId, role: 'owner' })
    .count<{ n: number }[]>({ n: '*' });
  return Number(r[0]?.n ?? 0);
}

/**
 * Changes a member's role (never the last owner's); `keepsKeys` false revokes the keys the member made.
 * Sessions started under the old role end.
 */
export async function updateMemberRole(
  trx: Knex.Transaction,
  scope: { workspaceId: number },
  input: { userId: number; role: Role; keepsKeys: boolean; actorId: number; actor: string; ip?: string | null },
): Promise<void> {
  const m = await trx('memberships').where({ workspace_id: scope.workspaceId, user_id: input.userId }).first();
  if (!m) throw notFound('That person is not a member of this workspace.');
  if (m.role === 'owner' && input.role !== 'owner' && (await ownerCount(trx, scope.workspaceId)) <= 1) {
    throw conflict('A workspace needs at least one owner. Make someone else owner first.', [
      { path: 'role', message: 'The last owner cannot change to another role.' },
    ]);
  }
  await trx('memberships').where({ id: m.id }).update({ role: input.role });
  if (!input.keepsKeys) {
    await revokeKeysMadeBy(trx, scope.workspaceId, input.userId, `its creator's role changed to ${input.role}`, input);
  }
  // Permissions are re-read on every request; the version bump also ends sessions started under the old role.
  await trx('users').where({ id: input.userId }).increment('session_version', 1);
  await createAuditEntry(
    {
      workspaceId: scope.workspaceId,
      userId: input.actorId,
      actor: input.actor,
      action: 'member.role_changed',
      target: String(input.userId),
      detail: { from: m.role, to: input.role },
      ip: input.ip,
    },
    trx,
  );
}

/** A member's API keys end with the member's access to make them; each revocation is in the audit log. */
export async function revokeKeysMadeBy(
  trx: Knex.Transaction,
  workspaceId: number,
  userId: number,
  reason: string,
  by: { actorId: number; actor: string; ip?: string | null },
): Promise<void> {
  const keys = await trx('api_keys')
    .where({ workspace_id: workspaceId, created_by: userId })
    .whereNull('revoked_at')
    .select('id', 'name', 'key_prefix');
  if (!keys.length) return;
  await trx('api_keys')
    .whereIn(
      'id',
      keys.map((k) => k.id),
    )
    .update({ revoked_at: nowIso() });
  for (const k of keys) {
    await createAuditEntry(
      {
        workspaceId,
        userId: by.actorId,
        actor: by.actor,
        action: 'apikey.revoked',
        target: `${k.name} (${k.key_prefix}…)`,
        detail: { reason },
        ip: by.ip,
      },
      trx,
    );
  }
}

export async function removeMember(
  scope: { workspaceId: number },
  input: { userId: number; actorId: number; actor: string; ip?: string | null },
): Promise<void> {
  await writeTx(async (trx) => {
    const m = await trx('memberships').where({ workspace_id: scope.workspaceId, user_id: input.userId }).first();
    if (!m) throw notFound('That person is not a member of this workspace.');
    if (m.role === 'owner' && (await ownerCount(trx, scope.workspaceId)) <= 1) {
      throw conflict('This is the last owner of the workspace; make someone else owner before removing them.');
    }
    await trx('memberships').where({ id: m.id }).delete();
    await trx('users').where({ id: input.userId }).increment('session_version', 1);
    await revokeKeysMadeBy(trx, scope.workspaceId, input.userId, 'its creator left the workspace', input);
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.actorId,
        actor: input.actor,
        action: 'member.removed',
        target: String(input.userId),
        detail: { role: m.role },
        ip: input.ip,
      },
      trx,
    );
  });
}

export interface InvitationDto {
  id: number;
  email: string;
  role: Role;
  expiresAt: string;
  createdAt: string;
}

/** Writes an invitation (replacing an open one for the same address); only the token's hash is stored. */
export async function insertInvitation(
  trx: Knex.Transaction,
  scope: { workspaceId: number },
  input: {
    email: string;
    role: Role;
    tokenHash: string;
    expiresAt: string;
    invitedBy: number;
    actor: string;
    ip?: string | null;
  },
): Promise<InvitationDto> {
  const email = normaliseEmail(input.email);
  const existing = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where({ 'm.workspace_id': scope.workspaceId, 'u.email': email })
    .first();
  if (existing) {
    throw conflict('That person is already a member of this workspace.', [
      { path: 'email', message: 'Already a member; change their role in the list instead.' },
    ]);
  }
  const now = nowIso();
  // A newer invitation replaces an open one for the same address.
  await trx('invitations')
    .where({ workspace_id: scope.workspaceId, email })
    .whereNull('accepted_at')
    .whereNull('revoked_at')
    .update({ revoked_at: now });
  const id = await insertId(
    trx('invitations')
      .insert({
        workspace_id: scope.workspaceId,
        email,
        role: input.role,
        token_hash: input.tokenHash,
        invited_by: input.invitedBy,
        expires_at: input.expiresAt,
        created_at: now,
      })
      .returning('id'),
  );
  await createAuditEntry(
    {
      workspaceId: scope.workspaceId,
      userId: input.invitedBy,
      actor: input.actor,
      action: 'member.invited',
      target: email,
      detail: { role: input.role },
      ip: input.ip,
    },
    trx,
  );
  return { id, email, role: input.role, expiresAt: input.expiresAt, createdAt: now };
}

export async function listOpenInvitations(scope: { workspaceId: number }): Promise<InvitationDto[]> {
  const rows = await db()('invitations')
    .where({ workspace_id: scope.workspaceId })
    .whereNull('accepted_at')
    .whereNull('revoked_at')
    .where('expires_at', '>', nowIso())
    .orderBy('created_at', 'desc');
  return rows.map((r) => ({
    id: Number(r.id),
    email: r.email,
    role: roleOf(r.role),
    expiresAt: r.expires_at,
    createdAt: r.created_at,
  }));
}

export async function revokeInvitation(scope: { workspaceId: number }, id: number): Promise<void> {
  const n = await db()('invitations')
    .where({ workspace_id: scope.workspaceId, id })
    .whereNull('accepted_at')
    .update({ revoked_at: nowIso() });
  if (!n) throw notFound('No open invitation with that id.');
}

export type InvitationLookup =
  | { state: 'open'; id: number; email: string; role: Role; workspace: WorkspaceDto }
  | { state: 'expired' | 'used' | 'unknown' };

export async function getInvitationByTokenHash(tokenHash: string): Promise<InvitationLookup> {
  const r = await db()('invitations as i')
    .join('workspaces as w', 'w.id', 'i.workspace_id')
    .where('i.token_hash', tokenHash)
    .select('i.*', 'w.slug', 'w.name as workspace_name', 'w.created_at as workspace_created_at')
    .first();
  if (!r || r.revoked_at) return { state: 'unknown' };
  if (r.accepted_at) return { state: 'used' };
  if (r.expires_at <= nowIso()) return { state: 'expired' };
  return {
    state: 'open',
    id: Number(r.id),
    email: r.email,
    role: roleOf(r.role),
    workspace: { id: Number(r.workspace_id), slug: r.slug, name: r.workspace_name, createdAt: r.workspace_created_at },
  };
}

/** Accepts an open invitation for the signed-in user; the invitation's address must be theirs. */
export async function acceptInvitationByHash(
  trx: Knex.Transaction,
  input: { tokenHash: string; userId: number; email: string; ip?: string | null },
): Promise<WorkspaceDto> {
  const r = await trx('invitations').where({ token_hash: input.tokenHash }).first();
  if (!r || r.revoked_at) throw notFound('This invitation does not exist or was withdrawn.');
  if (r.accepted_at) throw conflict('This invitation has already been used.');
  if (r.expires_at <= nowIso()) throw conflict('This invitation has expired; ask for a new one.');
  if (normaliseEmail(input.email) !== r.email) {
    throw conflict(`This invitation was sent to ${r.email}. Sign in with that address to accept it.`);
  }
  const now = nowIso();
  const already = await trx('memberships').where({ workspace_id: r.workspace_id, user_id: input.userId }).first();
  if (!already) {
    await trx('memberships').insert({
      workspace_id: r.workspace_id,
      user_id: input.userId,
      role: r.role,
      created_at: now,
    });
  }
  await trx('invitations').where({ id: r.id }).update({ accepted_at: now });
  await createAuditEntry(
    {
      workspaceId: r.workspace_id,
      userId: input.userId,
      actor: r.email,
      action: 'member.joined',
      target: r.email,
      detail: { role: r.role },
      ip: input.ip,
    },
    trx,
  );
  const w = await trx('workspaces').where({ id: r.workspace_id }).first();
  return wsDto(w);
}
