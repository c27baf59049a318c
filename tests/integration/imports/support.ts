import { db, insertId } from '@/db/client';
import { TEST_ORIGIN } from '../../support/test-db';

/** An invented engine (plausible certification-style values, not a real engine) for the test types. */
const ENGINE = {
  ff_idle_kg_s: 0.1,
  ff_approach_kg_s: 0.32,
  ff_climb_out_kg_s: 0.98,
  ff_take_off_kg_s: 1.2,
  ei_idle_g_kg: 4.6,
  ei_approach_g_kg: 10.2,
  ei_climb_out_g_kg: 22.4,
  ei_take_off_g_kg: 28.1,
};

/** Gives a workspace two fleets, an engine-backed type T-LR (fleet "Long haul") and a direct-EI type T-SST. */
export async function addScheduleLibrary(
  workspaceId: number,
): Promise<{ longHaulFleetId: number; studyFleetId: number }> {
  const now = new Date().toISOString();
  const engineId = await insertId(
    db()('engines')
      .insert({ workspace_id: workspaceId, name: 'Test turbofan', ...ENGINE, created_at: now, updated_at: now })
      .returning('id'),
  );
  const longHaulFleetId = await insertId(
    db()('fleets').insert({ workspace_id: workspaceId, name: 'Long haul', created_at: now }).returning('id'),
  );
  const studyFleetId = await insertId(
    db()('fleets').insert({ workspace_id: workspaceId, name: 'Study', created_at: now }).returning('id'),
  );
  await db()('aircraft_types').insert([
    {
      workspace_id: workspaceId,
      code: 'T-LR',
      engine_id: engineId,
      engine_count: 2,
      typical_mach: 0.84,
      typical_flight_level: 370,
      default_fleet_id: longHaulFleetId,
      created_at: now,
      updated_at: now,
    },
    {
      workspace_id: workspaceId,
      code: 'T-SST',
      engine_id: null,
      engine_count: 4,
      typical_mach: 1.7,
      typical_flight_level: 580,
      direct_ei_g_kg: 11.5,
      default_fleet_id: studyFleetId,
      created_at: now,
      updated_at: now,
    },
    {
      workspace_id: workspaceId,
      code: 'T-BARE',
      engine_id: null,
      engine_count: 2,
      typical_mach: 0.8,
      typical_flight_level: 350,
      created_at: now,
      updated_at: now,
    },
  ]);
  return { longHaulFleetId: Number(longHaulFleetId), studyFleetId: Number(studyFleetId) };
}

export const HEADER = 'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg';

/** A CSV from lines (the header first), with CRLF line ends as spreadsheet programs write them. */
export function csv(...lines: string[]): string {
  return lines.join('\r\n') + '\r\n';
}

/** A multipart upload of `content` in the field `file`, as a browser or API client sends it. */
export function uploadRequest(
  slug: string,
  content: string | Uint8Array<ArrayBuffer>,
  opts: { cookie?: string; bearer?: string; fileName?: string; field?: string } = {},
): Request {
  const form = new FormData();
  const bytes = typeof content === 'string' ? new TextEncoder().encode(content) : content;
  form.set(opts.field ?? 'file', new File([bytes], opts.fileName ?? 'schedule.csv', { type: 'text/csv' }));
  const headers = new Headers({ host: new URL(TEST_ORIGIN).host });
  if (opts.cookie) headers.set('cookie', opts.cookie);
  if (opts.bearer) headers.set('authorization', `Bearer ${opts.bearer}`);
  return new Request(new URL(`/api/v1/workspaces/${slug}/imports`, TEST_ORIGIN), {
    method: 'POST',
    headers,
    body: form,
  });
}

const ROUTES: [string, string, number][] = [
  ['EFHK', 'RJAA', 52_000],
  ['EGLL', 'KSEA', 47_000],
  ['BIKF', 'PANC', 36_000],
  ['ENGM', 'CYVR', 44_000],
  ['RJAA', 'EFHK', 53_000],
];

/** `n` distinct good rows for type T-LR (flight numbers differ), dated in November 2026. */
export function goodRows(n: number, prefix = 'TP'): string[] {
  const out: string[] = [];
  for (let i = 0; i < n; i++) {
    const [o, d, fuel] = ROUTES[i % ROUTES.length];
    const day = String(1 + (i % 28)).padStart(2, '0');
    out.push(`2026-11-${day},${prefix}${i},${o},${d},T-LR,${350 + (i % 5) * 10},${fuel + (i % 7) * 100}`);
  }
  return out;
}
