import { describe, expect, it } from 'vitest';
import { useTestDatabase } from '../../support/test-db';
import { db } from '@/db/client';
import { seed as seedAccounts } from '@/seeds/01_demo_accounts';
import { seed as seedEngines } from '@/seeds/02_demo_engines';
import { seed as seedFlights } from '@/seeds/03_demo_flights';
import type { FleetPercentiles, FleetPercentilesPending } from '@/lib/fleets/types';
import { fleetPercentiles } from '@/lib/fleets/percentiles';

/** The percentiles, failing the test when they are missing or still pending. */
function ready(p: FleetPercentiles | FleetPercentilesPending | null): FleetPercentiles {
  if (!p || 'pending' in p) throw new Error('fleet percentiles not ready');
  return p;
}

useTestDatabase({ DEMO_TODAY: '2026-11-20' });

describe('demo flights', () => {
  it('are seeded with their fleet-sampling components, so the demo fleets show bands without a backfill', async () => {
    await seedAccounts(db());
    await seedEngines(db());
    await seedFlights(db());
    const screened = Number(
      ((await db()('flights').where({ status: 'screened' }).count({ n: '*' }).first()) as { n: number }).n,
    );
    const stored = Number(
      (
        (await db()('flight_components as fc')
          .join('flights as fl', 'fl.id', 'fc.flight_id')
          .whereRaw('fc.engine_version = fl.engine_version')
          .count({ n: '*' })
          .first()) as { n: number }
      ).n,
    );
    expect(screened).toBeGreaterThan(0);
    expect(stored).toBe(screened);
    const ws = (await db()('workspaces').where({ slug: 'skarn-polar' }).first('id')) as { id: number };
    const p = ready(await fleetPercentiles({ workspaceId: Number(ws.id) }, { from: '2026-09-01', to: '2026-11-30' }));
    expect(p?.flightsLeftOut).toBe(0);
    expect(p.total.noxAboveTropopauseKg.p5).toBeLessThan(p.total.noxAboveTropopauseKg.p95);
  }, 300_000);
});
