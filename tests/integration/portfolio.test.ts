import { describe, expect, it } from 'vitest';
import { makeWorkspace, useTestDatabase } from '../support/test-db';
import { rebuildFlightRollups } from '@/db/flight-rollups';
import { db } from '@/db/client';
import { getMonthlyTrend, getMonthSummaries } from '@/db/portfolio';
import { getBillableUnits, getUsageSummary } from '@/lib/billing/usage-summary';
import { COUNT_LABELS } from '@/lib/counts';

useTestDatabase({ DEMO_TODAY: '2026-11-20' });

async function flight(workspaceId: number, date: string, above: number, total: number, status = 'screened') {
  await db()('flights').insert({
    workspace_id: workspaceId,
    date,
    flight: `TP${Math.random().toString(36).slice(2, 8)}`,
    origin: 'EGLL',
    destination: 'PANC',
    aircraft_code: 'X',
    cruise_fl: 370,
    max_fl: 370,
    input_json: '{}',
    status,
    fuel_kg: 1000,
    nox_total_kg: total,
    nox_above_kg: above,
    ozone_central_kg: above / 2,
    created_at: new Date().toISOString(),
  });
  // Rows written straight into the table: their monthly roll-ups as the worker would keep them.
  await rebuildFlightRollups(db(), workspaceId);
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
    expect(trend[5]).toMatchObject({
      importedFlightsScreened: 2,
      savedScreenings: 0,
      noxTotalKg: 50,
      noxAboveKg: 15,
      ozoneCentralKg: 7.5,
    });
    expect(trend[3]).toMatchObject({ importedFlightsScreened: 1, noxAboveKg: 7 });
    expect(trend[4]).toMatchObject({ importedFlightsScreened: 0, noxTotalKg: 0 });
    const month = (await getMonthSummaries({ workspaceIds: [ws.id] })).get(ws.id);
    expect(month).toMatchObject({ importedFlightsScreened: 2, savedScreenings: 0, noxAboveKg: 15, noxTotalKg: 50 });
  });
});

describe('each count is named by what it counts', () => {
  it('saved screenings, imported flights screened and billable units are three labels, never one', () => {
    const labels = Object.values(COUNT_LABELS);
    expect(new Set(labels).size).toBe(labels.length);
  });

  it('an earlier quarter imported this month: flights count by flight date, billable units by when screened, the same as the billing page', async () => {
    const ws = await makeWorkspace();
    // Flights of an earlier quarter, screened (and so billed) today.
    for (let i = 0; i < 5; i++) {
      await flight(ws.id, '2026-07-1' + i, 1, 2);
    }
    const ids = ((await db()('flights').where({ workspace_id: ws.id }).select('id')) as { id: number }[]).map((f) =>
      Number(f.id),
    );
    const now = '2026-11-19T10:00:00.000Z';
    await db()('usage_events').insert(
      ids.map((id) => ({
        workspace_id: ws.id,
        kind: 'imported_flight',
        source_id: id,
        idempotency_key: `tp-imported_flight-${id}`,
        quantity: 1,
        occurred_at: now,
      })),
    );
    // A saved screening made today.
    await db()('screenings').insert({
      workspace_id: ws.id,
      name: 'one',
      input_json: '{}',
      result_json: '{}',
      engine_version: 'x',
      distance_km: 1,
      fuel_kg: 1,
      nox_total_kg: 4,
      nox_above_kg: 3,
      fraction_above: 0.75,
      ozone_central_kg: 0,
      ozone_low_kg: 0,
      ozone_high_kg: 0,
      created_at: now,
    });
    const month = (await getMonthSummaries({ workspaceIds: [ws.id] })).get(ws.id);
    expect(month).toMatchObject({ savedScreenings: 1, importedFlightsScreened: 0, noxAboveKg: 3 });
    const billable = await getBillableUnits({ workspaceId: ws.id });
    const meter = await getUsageSummary({ workspaceId: ws.id }, { reconcile: false });
    expect(billable.units).toBe(meter.units);
    expect(billable).toMatchObject({ periodStart: meter.periodStart, periodEnd: meter.periodEnd });
  });

  it("the portfolio's billable units follow the billing period, not the calendar month", async () => {
    const ws = await makeWorkspace();
    // A subscription period that started last month: a unit of late last month is in it.
    await db()('workspace_billing').where({ workspace_id: ws.id }).update({
      status: 'active',
      subscription_id: 'sub_x',
      current_period_start: '2026-10-25T00:00:00.000Z',
      current_period_end: '2026-11-25T00:00:00.000Z',
    });
    await db()('usage_events').insert([
      {
        workspace_id: ws.id,
        kind: 'screening',
        source_id: 900001,
        idempotency_key: 'k-900001',
        quantity: 1,
        occurred_at: '2026-10-28T10:00:00.000Z',
      },
      {
        workspace_id: ws.id,
        kind: 'screening',
        source_id: 900002,
        idempotency_key: 'k-900002',
        quantity: 1,
        occurred_at: '2026-11-10T10:00:00.000Z',
      },
      {
        workspace_id: ws.id,
        kind: 'screening',
        source_id: 900003,
        idempotency_key: 'k-900003',
        quantity: 1,
        occurred_at: '2026-10-20T10:00:00.000Z',
      },
    ]);
    const billable = await getBillableUnits({ workspaceId: ws.id });
    expect(billable.units).toBe(2);
    expect((await getUsageSummary({ workspaceId: ws.id }, { reconcile: false })).units).toBe(2);
  });
});
