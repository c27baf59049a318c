import { can, type Permission, type Role } from './policy';

/** Where a role starts inside one workspace: finance admins on billing, everyone else on the overview. */
export function workspaceLanding(slug: string, role: Role): string {
  return role === 'billing' ? `/w/${slug}/settings/billing` : `/w/${slug}`;
}

export function landingPath(memberships: { workspace: { slug: string }; role: Role }[]): string {
  if (memberships.length !== 1) return '/workspaces';
  const [m] = memberships;
  return workspaceLanding(m.workspace.slug, m.role);
}

/**
 * The permission each workspace page asks of its role, by the first segment after `/w/{slug}`
 * (settings pages by their second). A test holds this table equal to the pages' own checks.
 */
export const PAGE_PERMISSIONS: Record<string, Permission> = {
  '': 'flights:read',
  screen: 'screenings:create',
  screenings: 'flights:read',
  flights: 'flights:read',
  fleets: 'flights:read',
  imports: 'flights:read',
  reports: 'flights:read',
  periods: 'flights:read',
  routes: 'flights:read',
  engines: 'flights:read',
  soundings: 'flights:read',
  fixes: 'flights:read',
  'settings/audit': 'audit:read',
  'settings/billing': 'billing:read',
  'settings/api-keys': 'apikeys:manage',
  'settings/members': 'members:manage',
};

/** The workspace slug and the permission a workspace page needs, or null for a path outside workspaces. */
export function workspacePageOf(path: string): { slug: string; permission: Permission | null } | null {
  const pathname = path.split(/[?#]/)[0];
  const m = /^\/w\/([^/]+)(?:\/(.*))?$/.exec(pathname);
  if (!m) return null;
  const rest = (m[2] ?? '').replace(/\/+$/, '');
  const parts = rest.split('/');
  const key = parts[0] === 'settings' ? parts.slice(0, 2).join('/') : parts[0];
  return { slug: decodeURIComponent(m[1]), permission: PAGE_PERMISSIONS[key] ?? null };
}

/** Why a callback was not followed, as the one-line notice the landing page shows. */
export const OUTSIDE_ROLE_NOTICE = 'outside-role';

/**
 * Where to go after sign-in: the callback when the user's role can see it; otherwise the role's
 * landing in that workspace with a notice; a workspace the user is not part of is left to the page (404).
 */
export function resolveAfterSignIn(
  callback: string | null,
  memberships: { workspace: { slug: string }; role: Role }[],
): string {
  if (!callback || callback === '/start') return landingPath(memberships);
  const page = workspacePageOf(callback);
  if (!page) return callback;
  const m = memberships.find((x) => x.workspace.slug === page.slug);
  if (!m || !page.permission || can(m.role, page.permission)) return callback;
  const landing = workspaceLanding(page.slug, m.role);
  return `${landing}?notice=${OUTSIDE_ROLE_NOTICE}`;
}
