import type { Role } from './policy';

export function landingPath(memberships: { workspace: { slug: string }; role: Role }[]): string {
  if (memberships.length !== 1) return '/workspaces';
  const [m] = memberships;
  return m.role === 'billing' ? `/w/${m.workspace.slug}/settings/billing` : `/w/${m.workspace.slug}`;
}
