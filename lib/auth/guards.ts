import 'server-only';
import { forbidden, notFound, redirect } from 'next/navigation';
import { currentUser, type SessionUser } from './session';
import { can, type Permission, type Role } from './policy';
import { getMembership, type WorkspaceDto } from '@/db/workspaces';
import { AppError, forbidden as forbiddenError, notFound as notFoundError, unauthenticated } from '@/lib/errors';
import { assertSameOrigin } from './origin';
import { log } from '@/lib/log';
import { appUrl } from '@/lib/env';
import { DOCUMENT_HEADER, RETURN_TO_HEADER, safeCallbackPath } from './callback';
import { workspaceLanding } from './landing';

export interface MemberContext {
  user: SessionUser;
  workspace: WorkspaceDto;
  role: Role;
}

/** The path and query of the page being rendered, as proxy.ts recorded it; null when unknown or unsafe. */
export async function requestedPath(): Promise<string | null> {
  const { headers } = await import('next/headers');
  return safeCallbackPath((await headers()).get(RETURN_TO_HEADER), appUrl());
}

/** True on a full page load, where the status code reaches the browser (see proxy.ts). */
export async function isDocumentRequest(): Promise<boolean> {
  const { headers } = await import('next/headers');
  return (await headers()).get(DOCUMENT_HEADER) === '1';
}

/** Pages: the signed-in user, or a redirect to sign-in that comes back to the whole path and query asked for. */
export async function requireUser(returnTo?: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) {
    const back = (await requestedPath()) ?? (returnTo ? safeCallbackPath(returnTo, appUrl()) : null);
    redirect(back ? `/signin?callbackUrl=${encodeURIComponent(back)}` : '/signin');
  }
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
  if (!can(m.role, permission)) {
    // The bare workspace address is everyone's way in: a role without the overview starts on its own landing.
    const asked = await requestedPath();
    const landing = workspaceLanding(m.workspace.slug, m.role);
    if (
      asked !== null &&
      asked.split(/[?#]/)[0].replace(/\/+$/, '') === `/w/${m.workspace.slug}` &&
      landing !== `/w/${m.workspace.slug}`
    )
      redirect(landing);
    forbidden();
  }
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
    log.warn(
      { event: 'authz.denied', via: 'action', userId: user.id, permission, role: m.role, workspace: slug },
      'permission denied',
    );
    throw forbiddenError();
  }
  return { user, workspace: m.workspace, role: m.role };
}

export function isAppError(err: unknown): err is AppError {
  return err instanceof AppError;
}
