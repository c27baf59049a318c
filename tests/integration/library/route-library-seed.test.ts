import { describe, expect, it } from 'vitest';
import { useTestDatabase } from '../../support/test-db';
import { db } from '@/db/client';
import { loadRouteLibrary } from '@/db/route-library';
import { parseFlightPlanRoute } from '@/lib/screening';
import { seed as seedAccounts } from '@/seeds/01_demo_accounts';
import { seed as seedLibrary } from '@/seeds/05_demo_route_library';

useTestDatabase();

describe('demo fix and airway library (invented)', () => {
  it('seeds skarn-polar idempotently, and a demo flight plan reads through it with no unplaced item', async () => {
    await seedAccounts(db());
    await seedLibrary(db());
    await seedLibrary(db());
    const ws = await db()('workspaces').where({ slug: 'skarn-polar' }).first();
    const library = await loadRouteLibrary({ workspaceId: Number(ws.id) });
    expect(library.fixes).toHaveLength(13);
    expect(library.airways?.map((a) => a.name)).toEqual(['XA2', 'XN1']);
    const r = parseFlightPlanRoute('N0480F370 DCT QXFRO XA2 QXIKE/N0480F390 XA2 QXELM DCT', {
      from: 'ENGM',
      to: 'CYVR',
      ...library,
    });
    expect(r.unresolved).toEqual([]);
    expect(r.waypoints.map((w) => w.name)).toEqual([
      'ENGM',
      'QXFRO',
      'QXGLA',
      'QXHAV',
      'QXIKE',
      'QXJOR',
      'QXKAL',
      'QXELM',
      'CYVR',
    ]);
    // The Arctic QXELM, not the North Atlantic one of the same name.
    expect(r.waypoints[7]).toMatchObject({ lat: 70, lon: -115 });
    expect(r.cruise.steps.map((s) => s.flightLevel)).toEqual([370, 390]);
  });
});
