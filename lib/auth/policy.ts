/**
 * The one table of who may do what inside a workspace. Guards, pages, navigation and the
 * authorisation tests all read it; nothing else decides permissions.
 */
import { ROLES, isRole, type Role } from './roles';

export { ROLES, isRole, type Role };

export const PERMISSIONS = [
  'workspace:read', // see the workspace exists, its name and your role
  'flights:read', // screenings, flights, fleets, reports, routes, engines, soundings
  'screenings:create',
  'imports:create',
  'imports:delete',
  'library:write', // saved routes, engines, aircraft types, soundings
  'navdata:write', // the fix and airway libraries read by flight-plan routes
  'fleets:write',
  'reports:create',
  'reports:send',
  'reports:delete',
  'members:manage',
  'apikeys:manage',
  'usage:read',
  'billing:read',
  'billing:manage',
  'audit:read',
  'library:copy', // copy engines, aircraft types and fleet definitions into or out of a workspace (owners: a consultant between clients)
  'periods:define', // custom reporting periods
  'periods:review', // move a period to review, which freezes its figures
  'periods:sign', // sign a period in review
  'periods:reopen', // reopen a period in review or signed (audited, with a reason)
  'targets:write', // targets per period and fleet
  'jobs:manage', // see the workspace's failed background jobs with their reason, and queue them again (owners)
] as const;
export type Permission = (typeof PERMISSIONS)[number];

export const POLICY: Record<Role, readonly Permission[]> = {
  owner: PERMISSIONS,
  planner: ['workspace:read', 'flights:read', 'screenings:create', 'imports:create', 'library:write', 'navdata:write'],
  analyst: [
    'workspace:read',
    'flights:read',
    'screenings:create',
    'imports:create',
    'imports:delete',
    'library:write',
    'fleets:write',
    'reports:create',
    'reports:send',
    'reports:delete',
    'periods:review',
    'targets:write',
  ],
  viewer: ['workspace:read', 'flights:read'],
  billing: ['workspace:read', 'usage:read', 'billing:read', 'billing:manage'],
};

/** Roles an API key may carry (planner by default, or analyst / viewer). */
export const API_KEY_ROLES = ['planner', 'analyst', 'viewer'] as const satisfies readonly Role[];

export function can(role: Role, permission: Permission): boolean {
  return POLICY[role].includes(permission);
}

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  planner: 'Flight planner',
  analyst: 'Sustainability analyst',
  viewer: 'Read-only',
  billing: 'Finance admin',
};
