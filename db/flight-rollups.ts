import type { Knex } from 'knex';

/**
 * Monthly roll-ups of screened flights (`flight_month_rollups`): per workspace, month, the flight's
 * own fleet (0: none), aircraft type (0: none), type code, cruise and highest level and engine
 * version and basis (planned or flown), the flight count and the sums of its figures. Every write that makes, changes or removes a
 * screened flight calls these functions inside its own transaction, so the roll-ups always equal the
 * sums of the rows. No `server-only` here: the seeds and the tests keep them too.
 */

type K = Knex | Knex.Transaction;

const KEY = [
  'workspace_id',
  'month',
  'fleet_id',
  'aircraft_type_id',
  'aircraft_code',
  'cruise_fl',
  'max_fl',
  'engine_version',
  'basis',
] as const;

const SUMS = [
  'flights',
  'fuel_warnings',
  'distance_km',
  'fuel_kg',
  'nox_total_kg',
  'nox_above_kg',
  'ozone_central_kg',
  'ozone_low_kg',
  'ozone_high_kg',
] as const;

const KEY_OF_FLIGHT = [
  'workspace_id',
  'substr(date, 1, 7)',
  'coalesce(fleet_id, 0)',
  'coalesce(aircraft_type_id, 0)',
  'aircraft_code',
  'cruise_fl',
  'max_fl',
  "coalesce(engine_version, '')",
  'basis',
];

const SUMS_OF_FLIGHTS = [
  'count(*)',
  'sum(CASE WHEN fuel_warning IS NULL THEN 0 ELSE 1 END)',
  'sum(coalesce(distance_km, 0))',
  'sum(fuel_kg)',
  'sum(coalesce(nox_total_kg, 0))',
  'sum(coalesce(nox_above_kg, 0))',
  'sum(coalesce(ozone_central_kg, 0))',
  'sum(coalesce(ozone_low_kg, 0))',
  'sum(coalesce(ozone_high_kg, 0))',
];

const INSERT = `INSERT INTO flight_month_rollups (${[...KEY, ...SUMS].join(', ')})`;
const UPSERT = `ON CONFLICT (${KEY.join(', ')}) DO UPDATE SET ${SUMS.map(
  (c) => `${c} = flight_month_rollups.${c} + excluded.${c}`,
).join(', ')}`;

/**
 * Adds (sign 1) or takes away (sign -1) the screened flights that `where` picks from the `flights`
 * table. Call it after a flight becomes screened, before a screened flight is deleted, and around a
 * change of its figures (take away, change, add back).
 */
export async function adjustFlightRollups(trx: K, where: (q: Knex.QueryBuilder) => void, sign: 1 | -1): Promise<void> {
  const q = trx('flights').where('status', 'screened');
  where(q);
  const sums = SUMS_OF_FLIGHTS.map((e) => (sign === 1 ? e : `-${e}`));
  // Ordered by the key, so concurrent writers on PostgreSQL lock the same roll-up rows in the same order.
  q.select(trx.raw([...KEY_OF_FLIGHT, ...sums].join(', ')))
    .groupByRaw(KEY_OF_FLIGHT.join(', '))
    .orderByRaw(KEY_OF_FLIGHT.join(', '));
  const { sql, bindings } = q.toSQL();
  await trx.raw(`${INSERT} ${sql} ${UPSERT}`, bindings as Knex.RawBinding[]);
}

/** Drops a workspace's roll-up rows left with no flights (after flights were taken away). */
export async function pruneFlightRollups(trx: K, workspaceIds: number[]): Promise<void> {
  if (!workspaceIds.length) return;
  await trx('flight_month_rollups').whereIn('workspace_id', workspaceIds).where('flights', '<=', 0).delete();
}

/**
 * Moves roll-ups from a fleet or aircraft type that is going away to "none" (0), as the flights'
 * own column is cleared with it (a deleted fleet, a deleted aircraft type).
 */
export async function clearRollupKey(
  trx: K,
  workspaceId: number,
  column: 'fleet_id' | 'aircraft_type_id',
  id: number,
): Promise<void> {
  const cols = [...KEY, ...SUMS].map((c) => (c === column ? '0' : c)).join(', ');
  await trx.raw(
    `${INSERT} SELECT ${cols} FROM flight_month_rollups WHERE workspace_id = ? AND ${column} = ? ${UPSERT}`,
    [workspaceId, id],
  );
  await trx('flight_month_rollups')
    .where({ workspace_id: workspaceId, [column]: id })
    .delete();
}

/** Rebuilds a workspace's roll-ups from its flights (seeds, repairs, tests that write rows directly). */
export async function rebuildFlightRollups(trx: K, workspaceId: number): Promise<void> {
  await trx('flight_month_rollups').where('workspace_id', workspaceId).delete();
  await adjustFlightRollups(trx, (q) => q.where('workspace_id', workspaceId), 1);
}

export type RollupSource =
  { rollup: false; from: string; to: string } | { rollup: true; fromMonth: string; toMonth: string };

const lastDayOf = (month: string) => {
  const [y, m] = month.split('-').map(Number);
  return `${month}-${String(new Date(Date.UTC(y, m, 0)).getUTCDate()).padStart(2, '0')}`;
};

function shiftMonth(month: string, by: number): string {
  const [y, m] = month.split('-').map(Number);
  const d = new Date(Date.UTC(y, m - 1 + by, 1));
  return `${String(d.getUTCFullYear()).padStart(4, '0')}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`;
}

/**
 * Splits an inclusive date range into the whole months the roll-ups answer and the part-months at
 * either end that only the flight rows can (absent bounds are open ends). A range within one month
 * that is not the whole month is one raw part.
 */
export function splitByWholeMonths(from: string | undefined, to: string | undefined): RollupSource[] {
  const start = from ?? '0001-01-01';
  const end = to ?? '9999-12-31';
  if (start > end) return [];
  const firstWhole = start.endsWith('-01') ? start.slice(0, 7) : shiftMonth(start.slice(0, 7), 1);
  const lastWhole = end === lastDayOf(end.slice(0, 7)) ? end.slice(0, 7) : shiftMonth(end.slice(0, 7), -1);
  if (firstWhole > lastWhole) return [{ rollup: false, from: start, to: end }];
  const out: RollupSource[] = [];
  if (start < `${firstWhole}-01`) out.push({ rollup: false, from: start, to: lastDayOf(shiftMonth(firstWhole, -1)) });
  out.push({ rollup: true, fromMonth: firstWhole, toMonth: lastWhole });
  if (end > lastDayOf(lastWhole)) out.push({ rollup: false, from: `${shiftMonth(lastWhole, 1)}-01`, to: end });
  return out;
}
