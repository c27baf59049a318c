import { describe, expect, it } from 'vitest';
import { makeWorkspace, useTestDatabase } from '../support/test-db';
import { rebuildFlightRollups } from '@/db/flight-rollups';
import { db, insertId } from '@/db/client';
import { getClientStatuses } from '@/db/portfolio';
import { copyLibrary } from '@/db/library-copy';
import { POLICY, ROLES, can } from '@/lib/auth/policy';
import { addScheduleLibrary } from './imports/support';

useTestDatabase({ DEMO_TODAY: '2026-11-20' });

async function flight(workspaceId: number, date: string, above: number, total: number) {
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
    status: 'screened',
    fuel_kg: 1000,
    nox_total_kg: total,
    nox_above_kg: above,
    ozone_central_kg: 0,
    created_at: '2026-11-01T00:00:00.000Z',
  });
  // Rows written straight into the table: their monthly roll-ups as the worker would keep them.
  await rebuildFlightRollups(db(), workspaceId);
}

async function importRow(workspaceId: number, status: string, hash: string) {
  await db()('imports').insert({
    workspace_id: workspaceId,
    kind: 'schedule',
    file_name: `${hash}.csv`,
    file_hash: hash,
    status,
    rows: 1,
    rows_done: 0,
    created_at: '2026-11-01T00:00:00.000Z',
  });
}

describe("the consultant's clients at a glance", () => {
  it('gives each client its six-month trend of NOx above the tropopause and share, running and failed imports, and the last report sent', async () => {
    const a = await makeWorkspace();
    const b = await makeWorkspace();
    await flight(a.id, '2026-11-02', 30, 100);
    await flight(a.id, '2026-11-09', 10, 100);
    await flight(a.id, '2026-09-15', 5, 50);
    await importRow(a.id, 'screening', 'h1');
    await importRow(a.id, 'queued', 'h2');
    await importRow(a.id, 'failed', 'h3');
    await importRow(a.id, 'complete', 'h4');
    const reportId = await insertId(
      db()('reports')
        .insert({
          workspace_id: a.id,
          name: 'Q4 fleet report',
          period_from: '2026-10-01',
          period_to: '2026-12-31',
          fleet_ids_json: '[]',
          summary_json: '{}',
          pdf: Buffer.from('x'),
          csv: '',
          created_at: '2026-11-10T00:00:00.000Z',
        })
        .returning('id'),
    );
    await db()('report_sends').insert([
      {
        report_id: reportId,
        recipients: JSON.stringify(['x@example.test']),
        status: 'sent',
        sent_at: '2026-11-11T09:00:00.000Z',
      },
      {
        report_id: reportId,
        recipients: JSON.stringify(['x@example.test', 'y@example.test']),
        status: 'sent',
        sent_at: '2026-11-12T09:00:00.000Z',
      },
      {
        report_id: reportId,
        recipients: JSON.stringify(['z@example.test']),
        status: 'failed',
        sent_at: '2026-11-13T09:00:00.000Z',
      },
    ]);
    const s = await getClientStatuses({ workspaceIds: [a.id, b.id] });
    const sa = s.get(a.id)!;
    expect(sa.trend.map((t) => t.month)).toEqual(['2026-06', '2026-07', '2026-08', '2026-09', '2026-10', '2026-11']);
    expect(sa.trend[5]).toEqual({ month: '2026-11', noxAboveKg: 40, shareAbove: 0.2 });
    expect(sa.trend[3]).toEqual({ month: '2026-09', noxAboveKg: 5, shareAbove: 0.1 });
    expect(sa.trend[4].shareAbove).toBeNull();
    expect(sa.imports).toEqual({ running: 2, failed: 1 });
    // The latest send that went out, not the failed one after it.
    expect(sa.lastReportSent).toMatchObject({
      reportId,
      reportName: 'Q4 fleet report',
      at: '2026-11-12T09:00:00.000Z',
      recipients: 2,
    });
    expect(s.get(b.id)).toMatchObject({ imports: { running: 0, failed: 0 }, lastReportSent: null });
  });
});

describe('copying an engine and aircraft-type library between clients', () => {
  it('only owners may copy a library', () => {
    expect(ROLES.filter((r) => can(r, 'library:copy'))).toEqual(['owner']);
    expect(POLICY.analyst).not.toContain('library:copy');
  });

  it('copies engines, types (pointing at the copied engine and fleet) and fleets, and keeps what the target already has', async () => {
    const from = await makeWorkspace();
    const to = await makeWorkspace();
    await addScheduleLibrary(from.id);
    const now = new Date().toISOString();
    // The target already has a type T-SST and a fleet "Study" of its own: both are kept untouched.
    const studyId = await insertId(
      db()('fleets')
        .insert({ workspace_id: to.id, name: 'Study', description: 'their own', created_at: now })
        .returning('id'),
    );
    await db()('aircraft_types').insert({
      workspace_id: to.id,
      code: 'T-SST',
      engine_count: 2,
      typical_mach: 2.0,
      typical_flight_level: 600,
      direct_ei_g_kg: 9,
      created_at: now,
      updated_at: now,
    });

    const r = await copyLibrary(
      { fromWorkspaceId: from.id, toWorkspaceId: to.id, include: { engines: true, aircraftTypes: true, fleets: true } },
      { userId: null, label: 'test' },
    );
    expect(r.engines).toEqual({ copied: ['Test turbofan'], skipped: [] });
    expect(r.aircraftTypes).toEqual({ copied: ['T-BARE', 'T-LR'], skipped: ['T-SST'] });
    expect(r.fleets).toEqual({ copied: ['Long haul'], skipped: ['Study'] });

    const engine = await db()('engines').where({ workspace_id: to.id, name: 'Test turbofan' }).first();
    const source = await db()('engines').where({ workspace_id: from.id, name: 'Test turbofan' }).first();
    for (const f of ['ff_idle_kg_s', 'ff_take_off_kg_s', 'ei_idle_g_kg', 'ei_take_off_g_kg'])
      expect(engine[f]).toBe(source[f]);
    const lr = await db()('aircraft_types').where({ workspace_id: to.id, code: 'T-LR' }).first();
    const longHaul = await db()('fleets').where({ workspace_id: to.id, name: 'Long haul' }).first();
    expect(lr).toMatchObject({
      engine_id: engine.id,
      default_fleet_id: longHaul.id,
      engine_count: 2,
      typical_mach: 0.84,
      typical_flight_level: 370,
    });
    expect(await db()('aircraft_types').where({ workspace_id: to.id, code: 'T-SST' }).first()).toMatchObject({
      typical_mach: 2.0,
      direct_ei_g_kg: 9,
    });
    expect(await db()('fleets').where({ id: studyId }).first()).toMatchObject({ description: 'their own' });
    // The source is untouched, and a second copy changes nothing.
    expect(
      Number(
        ((await db()('aircraft_types').where({ workspace_id: from.id }).count({ n: '*' }).first()) as { n: number }).n,
      ),
    ).toBe(3);
    const again = await copyLibrary(
      { fromWorkspaceId: from.id, toWorkspaceId: to.id, include: { engines: true, aircraftTypes: true, fleets: true } },
      { userId: null, label: 'test' },
    );
    expect(again.engines.copied).toEqual([]);
    expect(again.aircraftTypes.copied).toEqual([]);
    expect(
      await db()('audit_log').where({ workspace_id: to.id, action: 'library.copied' }).count({ n: '*' }).first(),
    ).toMatchObject({ n: 2 });
  });

  it('types only: brings the engines and default fleets they use, and no other fleet', async () => {
    const from = await makeWorkspace();
    const to = await makeWorkspace();
    await addScheduleLibrary(from.id);
    await db()('fleets').insert({ workspace_id: from.id, name: 'Unused', created_at: new Date().toISOString() });
    const r = await copyLibrary(
      {
        fromWorkspaceId: from.id,
        toWorkspaceId: to.id,
        include: { engines: false, aircraftTypes: true, fleets: false },
      },
      { userId: null, label: 'test' },
    );
    expect(r.engines.copied).toEqual(['Test turbofan']);
    expect(r.fleets.copied.sort()).toEqual(['Long haul', 'Study']);
    expect(await db()('fleets').where({ workspace_id: to.id, name: 'Unused' }).first()).toBeUndefined();
  });

  it('refuses to copy a workspace onto itself', async () => {
    const ws = await makeWorkspace();
    await expect(
      copyLibrary(
        { fromWorkspaceId: ws.id, toWorkspaceId: ws.id, include: { engines: true, aircraftTypes: true, fleets: true } },
        { userId: null, label: 'test' },
      ),
    ).rejects.toMatchObject({ status: 400 });
  });
});
