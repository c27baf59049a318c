import { describe, expect, it } from 'vitest';
import { makeWorkspace, useTestDatabase } from '../support/test-db';
import { db } from '@/db/client';
import { getMonthlyTrend, getMonthSummaries } from '@/db/portfolio';

useTestDatabase({ DEMO_TODAY: '2026-11-20' });

async function flight(workspaceId: number, date: string, above: number, total: number, status = 'screened') {
  await db()('flights').insert({
    workspace_id: workspaceId, date, flight: `TP${Math.random().toString(36).slice(2, 8)}`, origin: 'EGLL', destination: 'PANC',
    aircraft_code: 'X', cruise_fl: 370, max_fl: 370, input_json: '{}', status, fuel_kg: 1000, nox_total_kg: total, nox_above_kg: above,
    ozone_central_kg: above / 2, created_at: new Date().toISOString(),
  });
}

describe('overview trend and month summary', () => {
  it('sums screened flights by flight month, zero-fills empty months, ignores pending ones and other workspaces', async () => {
    const ws = await makeWorkspace();
    const other = await makeWorkspace();
    await flight(ws.id, '2026-11-02', 10, 40);
    await flight(ws.id, '2026-11-19', 5, 10);
    await flight(ws.id, '2026-09-30', 7, 7);
    await flight(ws.id, '2026-11-03', 99, 99, 'pending');
    await flight(other.id, '2026-11-05', 1000, 1000);
    const trend = await getMonthlyTrend({ workspaceId: ws.id }, 6);
    expect(trend.map((t) => t.month)).toEqual(['2026-06', '2026-07', '2026-08', '2026-09', '2026-10', '2026-11']);
    expect(trend[5]).toMatchObject({ flights: 2, noxTotalKg: 50, noxAboveKg: 15, ozoneCentralKg: 7.5 });
    expect(trend[3]).toMatchObject({ flights: 1, noxAboveKg: 7 });
    expect(trend[4]).toMatchObject({ flights: 0, noxTotalKg: 0 });
    const month = (await getMonthSummaries({ workspaceIds: [ws.id] })).get(ws.id);
    expect(month).toMatchObject({ flightsScreened: 2, noxAboveKg: 15, noxTotalKg: 50 });
  });
});
