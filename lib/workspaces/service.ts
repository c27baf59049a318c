import 'server-only';
import { writeTx } from '@/db/client';
import {
  acceptInvitationByHash,
  getInvitationByTokenHash,
  insertInvitation,
  insertWorkspace,
  updateMemberRole,
  type InvitationDto,
  type InvitationLookup,
  type WorkspaceDto,
} from '@/db/workspaces';
import { can, type Role } from '@/lib/auth/policy';
import { randomToken, sha256Hex } from '@/lib/auth/tokens';
import { startTrial } from '@/lib/billing/trial';

/** How long an invitation link works. */
export const INVITATION_DAYS = 7;

/** A new workspace with its owner; every new workspace starts on a free trial, written in the same transaction. */
export function createWorkspace(input: {
  name: string;
  slug?: string;
  ownerId: number;
  actor?: string;
  ip?: string | null;
}): Promise<WorkspaceDto> {
  return writeTx(async (trx) => {
    const workspace = await insertWorkspace(trx, input);
    await startTrial(workspace, trx);
    return workspace;
  });
}

/** Changes a member's role; one who may no longer manage keys loses the keys they made. */
export function changeMemberRole(
  scope: { workspaceId: number },
  input: { userId: number; role: Role; actorId: number; actor: string; ip?: string | null },
): Promise<void> {
  return writeTx((trx) => updateMemberRole(trx, scope, { ...input, keepsKeys: can(input.role, 'apikeys:manage') }));
}

/** Creates an invitation and returns its one-time token (only its hash is stored). */
export async function createInvitation(
  scope: { workspaceId: number },
  input: { email: string; role: Role; invitedBy: number; actor: string; ip?: string | null },
): Promise<{ invitation: InvitationDto; token: string }> {
  const token = randomToken();
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000).toISOString();
  const invitation = await writeTx((trx) =>
    insertInvitation(trx, scope, { ...input, tokenHash: sha256Hex(token), expiresAt }),
  );
  return { invitation, token };
}

/** What an invitation link leads to: open (with its workspace), expired, used or unknown. */
export function getInvitationByToken(token: string): Promise<InvitationLookup> {
  return getInvitationByTokenHash(sha256Hex(token));
}

/** Accepts an open invitation for the signed-in user; the invitation's address must be theirs. */
export function acceptInvitation(input: {
  token: string;
  userId: number;
  email: string;
  ip?: string | null;
}): Promise<WorkspaceDto> {
  const { token, ...rest } = input;
  return writeTx((trx) => acceptInvitationByHash(trx, { ...rest, tokenHash: sha256Hex(token) }));
}
