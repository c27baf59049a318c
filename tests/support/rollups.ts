import { expect } from 'vitest';
import { db } from '@/db/client';

type Row = Record<string, unknown>;

/** The roll-ups recomputed from the flight rows, by their key. */
async function rollupsFromRows(workspaceId: number): Promise<Map<string, number[]>> {
  const rows = (await db()('flights')
    .where({ workspace_id: workspaceId, status: 'screened' })
    .select(
      db().raw(
        "substr(date, 1, 7) as month, coalesce(fleet_id, 0) as fleet_id, coalesce(aircraft_type_id, 0) as aircraft_type_id, aircraft_code, cruise_fl, max_fl, coalesce(engine_version, '') as engine_version",
      ),
    )
    .count({ flights: '*' })
    .sum({
      distance_km: 'distance_km',
      fuel_kg: 'fuel_kg',
      nox_total_kg: 'nox_total_kg',
      nox_above_kg: 'nox_above_kg',
      ozone_central_kg: 'ozone_central_kg',
      ozone_low_kg: 'ozone_low_kg',
      ozone_high_kg: 'ozone_high_kg',
    })
    .select(db().raw('sum(case when fuel_warning is null then 0 else 1 end) as fuel_warnings'))
    .groupByRaw(
      "substr(date, 1, 7), coalesce(fleet_id, 0), coalesce(aircraft_type_id, 0), aircraft_code, cruise_fl, max_fl, coalesce(engine_version, '')",
    )) as Row[];
  return byKey(rows);
}

const SUM_COLUMNS = [
  'flights',
  'fuel_warnings',
  'distance_km',
  'fuel_kg',
  'nox_total_kg',
  'nox_above_kg',
  'ozone_central_kg',
  'ozone_low_kg',
  'ozone_high_kg',
];

function byKey(rows: Row[]): Map<string, number[]> {
  return new Map(
    rows.map((r) => [
      [r.month, r.fleet_id, r.aircraft_type_id, r.aircraft_code, r.cruise_fl, r.max_fl, r.engine_version]
        .map(String)
        .join('|'),
      SUM_COLUMNS.map((c) => Number(r[c] ?? 0)),
    ]),
  );
}

/** The stored monthly roll-ups of a workspace equal the sums of its screened flight rows. */
export async function expectRollupsMatchRows(workspaceId: number): Promise<void> {
  const stored = byKey((await db()('flight_month_rollups').where({ workspace_id: workspaceId })) as Row[]);
  const truth = await rollupsFromRows(workspaceId);
  expect([...stored.keys()].sort()).toEqual([...truth.keys()].sort());
  for (const [key, want] of truth) {
    const got = stored.get(key) ?? [];
    expect(got.slice(0, 2)).toEqual(want.slice(0, 2));
    for (let i = 2; i < want.length; i++) expect(got[i]).toBeCloseTo(want[i], 6);
  }
}
