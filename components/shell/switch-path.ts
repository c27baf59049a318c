import { can, type Role } from '@/lib/auth/policy';
import { WORKSPACE_SECTIONS } from './workspace-nav';

const SECTIONS = WORKSPACE_SECTIONS.flatMap((s) => s.items).filter((i) => i.path !== '');

/**
 * Where switching to another workspace goes from `pathname`: the same section there when the role
 * there may open it (a record's id or filters belong to the old workspace, so only the section is
 * kept), otherwise that role's landing (billing for a finance admin, the overview for the rest).
 */
export function switchWorkspacePath(pathname: string, toSlug: string, toRole: Role): string {
  const rest = /^\/w\/[^/?#]+(\/[^?#]*)?/.exec(pathname)?.[1] ?? '';
  const section = SECTIONS.filter((i) => rest === i.path || rest.startsWith(`${i.path}/`)).sort(
    (a, b) => b.path.length - a.path.length,
  )[0];
  if (section && can(toRole, section.permission)) return `/w/${toSlug}${section.path}`;
  return toRole === 'billing' ? `/w/${toSlug}/settings/billing` : `/w/${toSlug}`;
}
