import { describe, expect, it } from 'vitest';
import { switchWorkspacePath } from '@/components/shell/switch-path';

describe('switching workspace keeps the page where the role allows it', () => {
  it.each([
    ['/w/skarn-polar/fleets', 'velloway-jets', 'owner', '/w/velloway-jets/fleets'],
    ['/w/skarn-polar/screenings/42', 'velloway-jets', 'viewer', '/w/velloway-jets/screenings'],
    ['/w/skarn-polar/screenings/compare', 'velloway-jets', 'owner', '/w/velloway-jets/screenings'],
    ['/w/skarn-polar/engines/aircraft/7', 'kestrel-mach', 'planner', '/w/kestrel-mach/engines'],
    ['/w/skarn-polar/screen', 'kestrel-mach', 'analyst', '/w/kestrel-mach/screen'],
    ['/w/skarn-polar/settings/billing', 'kestrel-mach', 'billing', '/w/kestrel-mach/settings/billing'],
    ['/w/skarn-polar/settings/audit', 'kestrel-mach', 'owner', '/w/kestrel-mach/settings/audit'],
    ['/w/skarn-polar', 'kestrel-mach', 'owner', '/w/kestrel-mach'],
  ] as const)('%s -> %s as %s: %s', (from, to, role, expected) => {
    expect(switchWorkspacePath(from, to, role)).toBe(expected);
  });

  it.each([
    // A viewer may not screen: the overview instead of a "not part of your role" page.
    ['/w/skarn-polar/screen', 'velloway-jets', 'viewer', '/w/velloway-jets'],
    // A finance admin sees no flight data: billing is their landing.
    ['/w/skarn-polar/fleets', 'kestrel-mach', 'billing', '/w/kestrel-mach/settings/billing'],
    ['/w/skarn-polar', 'kestrel-mach', 'billing', '/w/kestrel-mach/settings/billing'],
    ['/w/skarn-polar/settings/members', 'velloway-jets', 'planner', '/w/velloway-jets'],
    ['/w/skarn-polar/settings/billing', 'velloway-jets', 'analyst', '/w/velloway-jets'],
  ] as const)('%s -> %s as %s falls back to the landing %s', (from, to, role, expected) => {
    expect(switchWorkspacePath(from, to, role)).toBe(expected);
  });
});
