import 'server-only';
import { forbidden, notFound, redirect } from 'next/navigation';
import { currentUser, type SessionUser } from './session';
import { can, type Permission, type Role } from './policy';
import { getMembership, type WorkspaceDto } from '@/db/workspaces';
import { AppError, forbidden as forbiddenError, notFound as notFoundError, unauthenticated } from '@/lib/errors';
import { assertSameOrigin } from './origin';
import { log } from '@/lib/log';

export interface MemberContext {
  user: SessionUser;
  workspace: WorkspaceDto;
  role: Role;
}

/** Pages: the signed-in user, or a redirect to sign-in that comes back here. */
export async function requireUser(returnTo?: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect(returnTo ? `/signin?callbackUrl=${encodeURIComponent(returnTo)}` : '/signin');
  return user;
}

/**
 * Pages: membership of the workspace and the permission, read fresh from the database.
 * Not a member (or no such workspace) -> 404; a member whose role lacks the permission -> 403.
 */
export async function requireMember(slug: string, permission: Permission = 'workspace:read'): Promise<MemberContext> {
  const user = await requireUser(`/w/${slug}`);
  const m = await getMembership({ userId: user.id, slug });
  if (!m) notFound();
  if (!can(m.role, permission)) forbidden();
  return { user, workspace: m.workspace, role: m.role };
}

/** Server actions: the same checks, as typed errors the action turns into its state. */
export async function requireActionUser(): Promise<SessionUser> {
  await assertSameOrigin();
  const user = await currentUser();
  if (!user) throw unauthenticated('Your session has ended. Sign in again.');
  return user;
}

export async function requireActionMember(slug: string, permission: Permission): Promise<MemberContext> {
  const user = await requireActionUser();
  const m = await getMembership({ userId: user.id, slug });
  if (!m) {
    log.warn({ event: 'authz.not_member', via: 'action', userId: user.id, workspace: slug }, 'not a member');
    throw notFoundError();
  }
  if (!can(m.role, permission)) {
    log.warn({ event: 'authz.denied', via: 'action', userId: user.id, permission, role: m.role, workspace: slug }, 'permission denied');
    throw forbiddenError();
  }
  return { user, workspace: m.workspace, role: m.role };
}

export function isAppError(err: unknown): err is AppError {
  return err instanceof AppError;
}
