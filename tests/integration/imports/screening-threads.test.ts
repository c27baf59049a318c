import { performance } from 'node:perf_hooks';
import { afterAll, describe, expect, it } from 'vitest';
import { call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import { requestImportRescreen, type ImportDto } from '@/db/imports';
import { rebuildFlightRollups } from '@/db/flight-rollups';
import { figuresOf } from '@/lib/imports/figures';
import { resetEnvForTests } from '@/lib/env';
import { closeScreeningPool, screeningThreads } from '@/lib/imports/screening-pool';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { ENGINE_VERSION, screenTotals, screenWithComponents, type ScreeningInput } from '@/lib/screening';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from './support';
import { expectRollupsMatchRows } from '../../support/rollups';

useTestDatabase({ SCREENING_THREADS: '2' });
afterAll(() => closeScreeningPool());

async function upload(rows: number, prefix: string): Promise<{ workspaceId: number; importId: number }> {
  const ws = await makeWorkspace(['analyst']);
  await addScheduleLibrary(ws.id);
  const r = await call<ImportDto>(
    importsRoute.POST,
    uploadRequest(ws.slug, csv(HEADER, ...goodRows(rows, prefix)), {
      cookie: await sessionCookie(ws.members.analyst.id),
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(202);
  return { workspaceId: ws.id, importId: r.body.id };
}

/** Screens everything queued and returns how busy the event loop was meanwhile (0..1). */
async function importUtilisation(): Promise<number> {
  const start = performance.eventLoopUtilization();
  await runImportsToCompletion();
  return performance.eventLoopUtilization(start).utilization;
}

describe('screening in worker threads', () => {
  it(
    'gives each flight the figures the engine gives on the event loop, one unit each, re-screens with the same figures and no new unit, and leaves the event loop mostly idle',
    { timeout: 180_000 },
    async () => {
      expect(screeningThreads()).toBe(2);
      // Start the threads (they compile the engine once) before measuring.
      await upload(50, 'W');
      await runImportsToCompletion();

      const threaded = await upload(3000, 'T');
      const threadedUtil = await importUtilisation();
      const rows = (await db()('flights')
        .where({ import_id: threaded.importId })
        .orderBy('id')
        .select(
          'id',
          'status',
          'input_json',
          'distance_km',
          'nox_total_kg',
          'nox_above_kg',
          'fraction_above',
          'mean_depth_above_km',
          'ozone_central_kg',
          'ozone_low_kg',
          'ozone_high_kg',
          'engine_version',
        )) as Record<string, unknown>[];
      expect(rows.length).toBe(3000);
      expect(rows.every((r) => r.status === 'screened')).toBe(true);
      for (const r of rows.filter((_, i) => i % 30 === 0)) {
        const f = figuresOf(screenTotals(JSON.parse(String(r.input_json)) as ScreeningInput));
        expect({
          distanceKm: Number(r.distance_km),
          noxTotalKg: Number(r.nox_total_kg),
          noxAboveTropopauseKg: Number(r.nox_above_kg),
          fractionAboveTropopause: Number(r.fraction_above),
          meanDepthAboveTropopauseKm: Number(r.mean_depth_above_km),
          ozoneCentralKg: Number(r.ozone_central_kg),
          ozoneLowKg: Number(r.ozone_low_kg),
          ozoneHighKg: Number(r.ozone_high_kg),
          engineVersion: String(r.engine_version),
        }).toEqual(f);
      }
      const units = (await db()('usage_events')
        .where({ workspace_id: threaded.workspaceId, kind: 'imported_flight' })
        .count({ n: '*' })
        .countDistinct({ d: 'source_id' })
        .first()) as { n: number | string; d: number | string };
      expect([Number(units.n), Number(units.d)]).toEqual([3000, 3000]);
      // On SQLite the threads also wrote the chunks (figures, roll-ups, units, progress) in their own
      // transactions: the roll-ups still equal the rows and the import counted every flight once.
      await expectRollupsMatchRows(threaded.workspaceId);
      const imp = (await db()('imports').where({ id: threaded.importId }).first()) as Record<string, unknown>;
      expect([imp.status, Number(imp.rows_done)]).toEqual(['complete', 3000]);

      // A re-screen screens on the threads too and restores the engine's figures, with no new units.
      const stale = rows.filter((_, i) => i % 3 === 0).map((r) => Number(r.id));
      await db()('flights').whereIn('id', stale).update({ engine_version: '2026.11.0', nox_above_kg: 0 });
      await rebuildFlightRollups(db(), threaded.workspaceId);
      await requestImportRescreen({ workspaceId: threaded.workspaceId }, threaded.importId, {
        engineVersion: ENGINE_VERSION,
        requestedBy: null,
        actor: 'test',
      });
      await runImportsToCompletion();
      const after = (await db()('flights')
        .whereIn('id', stale)
        .select('id', 'nox_above_kg', 'engine_version')) as Record<string, unknown>[];
      const before = new Map(rows.map((r) => [Number(r.id), Number(r.nox_above_kg)]));
      expect(after.every((r) => r.engine_version === ENGINE_VERSION)).toBe(true);
      expect(after.every((r) => Number(r.nox_above_kg) === before.get(Number(r.id)))).toBe(true);
      await expectRollupsMatchRows(threaded.workspaceId);
      const unitsAfter = await db()('usage_events')
        .where({ workspace_id: threaded.workspaceId, kind: 'imported_flight' })
        .count({ n: '*' })
        .first();
      expect(Number((unitsAfter as { n: number | string }).n)).toBe(3000);
      // Then the worker built each flight's fleet-sampling components on the threads, as the engine does.
      const comps = (await db()('flight_components')
        .where({ workspace_id: threaded.workspaceId })
        .orderBy('flight_id')
        .select('flight_id', 'data')) as { flight_id: number; data: Uint8Array }[];
      expect(comps.length).toBe(3000);
      const first = JSON.parse(String(rows[0].input_json)) as ScreeningInput;
      expect(new Uint8Array(comps[0].data)).toEqual(screenWithComponents(first).components);

      // The same import screened on the event loop, for comparison.
      process.env.SCREENING_THREADS = '0';
      resetEnvForTests();
      try {
        expect(screeningThreads()).toBe(0);
        await upload(3000, 'I');
        const inlineUtil = await importUtilisation();
        console.info(
          `[screening-threads] event-loop utilisation during a 3000-row import: ${threadedUtil.toFixed(2)} with 2 threads, ${inlineUtil.toFixed(2)} on the loop`,
        );
        // Screening and (on SQLite) the chunk writes run on the threads: the loop is left mostly idle.
        expect(threadedUtil).toBeLessThan(inlineUtil * 0.5);
      } finally {
        process.env.SCREENING_THREADS = '2';
        resetEnvForTests();
      }
    },
  );
});
