import { can, type Permission, type Role } from '@/lib/auth/policy';
import { NavLink } from './nav-link';

interface Item {
  path: string;
  label: string;
  permission: Permission;
  exact?: boolean;
}

/** The workspace's sections; each shows only when the member's role may open it. */
export const WORKSPACE_SECTIONS: { title: string; items: Item[] }[] = [
  {
    title: 'Plan',
    items: [
      { path: '', label: 'Overview', permission: 'flights:read', exact: true },
      { path: '/screen', label: 'Screen a flight', permission: 'screenings:create' },
      { path: '/screenings', label: 'Screenings', permission: 'flights:read' },
      { path: '/routes', label: 'Saved routes', permission: 'flights:read' },
      { path: '/engines', label: 'Engines & aircraft', permission: 'flights:read' },
      { path: '/soundings', label: 'Soundings', permission: 'flights:read' },
      { path: '/fixes', label: 'Fixes & airways', permission: 'flights:read' },
    ],
  },
  {
    title: 'Report',
    items: [
      { path: '/imports', label: 'Imports', permission: 'flights:read' },
      { path: '/flights', label: 'Flights', permission: 'flights:read' },
      { path: '/fleets', label: 'Fleets', permission: 'flights:read' },
      { path: '/reports', label: 'Reports', permission: 'flights:read' },
      { path: '/periods', label: 'Periods & sign-off', permission: 'flights:read' },
    ],
  },
  {
    title: 'Settings',
    items: [
      { path: '/settings/members', label: 'Members', permission: 'members:manage' },
      { path: '/settings/api-keys', label: 'API keys', permission: 'apikeys:manage' },
      { path: '/settings/billing', label: 'Billing', permission: 'billing:read' },
      { path: '/settings/audit', label: 'Audit log', permission: 'audit:read' },
    ],
  },
];

export function WorkspaceNav({
  slug,
  role,
  hidden = [],
  label = 'Workspace',
}: {
  slug: string;
  role: Role;
  hidden?: string[];
  label?: string;
}) {
  return (
    <nav aria-label={label} className="space-y-5">
      {WORKSPACE_SECTIONS.map((section) => {
        const items = section.items.filter((i) => can(role, i.permission) && !hidden.includes(i.path));
        if (!items.length) return null;
        return (
          <div key={section.title}>
            <p className="px-3 pb-1 text-xs font-semibold uppercase tracking-wide text-ink-faint">{section.title}</p>
            <ul className="space-y-0.5">
              {items.map((i) => (
                <li key={i.path}>
                  <NavLink href={`/w/${slug}${i.path}`} exact={i.exact}>
                    {i.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </div>
        );
      })}
    </nav>
  );
}
