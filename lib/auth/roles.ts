/**
 * The workspace roles as plain data (no imports): a leaf that `db/` may read to check a stored role.
 * What each role may do is in `policy.ts`.
 */
export const ROLES = ['owner', 'planner', 'analyst', 'viewer', 'billing'] as const;
export type Role = (typeof ROLES)[number];

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}
