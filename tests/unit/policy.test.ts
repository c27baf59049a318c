import { describe, expect, it } from 'vitest';
import { POLICY, PERMISSIONS, ROLES, can } from '@/lib/auth/policy';
import { landingPath } from '@/lib/auth/landing';

describe('role -> permission table', () => {
  it.each([
    ['owner', 'members:manage', true],
    ['planner', 'screenings:create', true],
    ['analyst', 'imports:create', true],
    ['planner', 'imports:create', true],
    ['planner', 'reports:send', false],
    ['analyst', 'reports:send', true],
    ['owner', 'reports:send', true],
    ['viewer', 'flights:read', true],
    ['viewer', 'screenings:create', false],
    ['billing', 'flights:read', false],
    ['billing', 'billing:manage', true],
    ['billing', 'usage:read', true],
    ['planner', 'usage:read', false],
    ['planner', 'navdata:write', true],
    ['owner', 'navdata:write', true],
    ['analyst', 'navdata:write', false],
    ['viewer', 'navdata:write', false],
    ['billing', 'navdata:write', false],
  ] as const)('%s may %s: %s', (role, permission, expected) => {
    expect(can(role, permission)).toBe(expected);
  });

  it('owner holds every permission; every permission is held by someone', () => {
    expect([...POLICY.owner].sort()).toEqual([...PERMISSIONS].sort());
    for (const p of PERMISSIONS) expect(ROLES.some((r) => can(r, p))).toBe(true);
  });

  it('landing after sign-in: one workspace -> it, finance admin -> billing, several -> portfolio', () => {
    const ws = (slug: string) => ({ slug });
    expect(landingPath([{ workspace: ws('a'), role: 'planner' }])).toBe('/w/a');
    expect(landingPath([{ workspace: ws('a'), role: 'billing' }])).toBe('/w/a/settings/billing');
    expect(
      landingPath([
        { workspace: ws('a'), role: 'owner' },
        { workspace: ws('b'), role: 'owner' },
      ]),
    ).toBe('/workspaces');
    expect(landingPath([])).toBe('/workspaces');
  });
});
