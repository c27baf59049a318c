import 'server-only';
import type { Knex } from 'knex';
import { db, insertId } from './client';
import { notFound } from '@/lib/errors';

export interface ScreeningSummary {
  id: number;
  name: string;
  createdAt: string;
  routeLabel: string;
  aircraftCode: string | null;
  flightLevel: number | null;
  flightDate: string | null;
  distanceKm: number;
  fuelKg: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  fractionAboveTropopause: number;
  ozoneLoss: { centralKg: number; lowKg: number; highKg: number };
  engineVersion: string;
}

/**
 * A saved screening as stored. `I` and `R` are the shapes of its input and result JSON; the
 * screening service names them (`ScreeningRecord` in lib/screening-service/service.ts).
 */
export interface StoredScreening<I = unknown, R = unknown> {
  id: number;
  name: string;
  createdAt: string;
  aircraftCode: string | null;
  input: I;
  result: R;
  /** The engine version the saved figures were made with (the stored column, not today's engine). */
  engineVersion: string;
  /** The screening this one re-made with a newer engine, if it is a re-screen. */
  rescreenOf: number | null;
}

type Row = Record<string, unknown>;

const summaryOf = (r: Row): ScreeningSummary => ({
  id: Number(r.id),
  name: String(r.name),
  createdAt: String(r.created_at),
  routeLabel: String(r.route_label),
  aircraftCode: (r.aircraft_code as string | null) ?? null,
  flightLevel: r.flight_level === null ? null : Number(r.flight_level),
  flightDate: (r.flight_date as string | null) ?? null,
  distanceKm: Number(r.distance_km),
  fuelKg: Number(r.fuel_kg),
  noxTotalKg: Number(r.nox_total_kg),
  noxAboveTropopauseKg: Number(r.nox_above_kg),
  fractionAboveTropopause: Number(r.fraction_above),
  ozoneLoss: { centralKg: Number(r.ozone_central_kg), lowKg: Number(r.ozone_low_kg), highKg: Number(r.ozone_high_kg) },
  engineVersion: String(r.engine_version),
});

const recordOf = <I, R>(r: Row): StoredScreening<I, R> => ({
  id: Number(r.id),
  name: String(r.name),
  createdAt: String(r.created_at),
  aircraftCode: (r.aircraft_code as string | null) ?? null,
  input: JSON.parse(String(r.input_json)) as I,
  result: JSON.parse(String(r.result_json)) as R,
  engineVersion: String(r.engine_version),
  rescreenOf: r.rescreen_of === null || r.rescreen_of === undefined ? null : Number(r.rescreen_of),
});

/** The screening a workspace saved under an idempotency key, with the body fingerprint kept beside it. */
export async function findScreeningByIdempotencyKey<I, R>(
  trx: Knex.Transaction,
  workspaceId: number,
  key: string,
): Promise<{ record: StoredScreening<I, R>; fingerprint: string | null } | null> {
  const prior = await trx('screenings').where({ workspace_id: workspaceId, idempotency_key: key }).first();
  if (!prior) return null;
  return { record: recordOf<I, R>(prior), fingerprint: (prior.idempotency_fingerprint as string | null) ?? null };
}

/** The re-screen of `rescreenOf` already made with `engineVersion`, if there is one. */
export async function findRescreen<I, R>(
  trx: Knex.Transaction,
  workspaceId: number,
  rescreenOf: number,
  engineVersion: string,
): Promise<StoredScreening<I, R> | null> {
  const prior = await trx('screenings')
    .where({ workspace_id: workspaceId, rescreen_of: rescreenOf, engine_version: engineVersion })
    .first();
  return prior ? recordOf<I, R>(prior) : null;
}

/** One new row of `screenings`: plain data, the figures already made by the engine. */
export interface NewScreeningRow {
  workspaceId: number;
  name: string;
  createdBy: number | null;
  apiKeyId: number | null;
  idempotencyKey: string | null;
  idempotencyFingerprint: string | null;
  rescreenOf: number | null;
  input: unknown;
  result: unknown;
  engineVersion: string;
  routeLabel: string;
  aircraftCode: string | null;
  flightLevel: number;
  flightDate: string | null;
  distanceKm: number;
  fuelKg: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  fractionAboveTropopause: number;
  ozoneLoss: { centralKg: number; lowKg: number; highKg: number };
  createdAt: string;
}

/** Inserts a screening inside the caller's transaction and returns it as stored. */
export async function insertScreening<I, R>(
  trx: Knex.Transaction,
  row: NewScreeningRow,
): Promise<StoredScreening<I, R>> {
  const id = await insertId(
    trx('screenings')
      .insert({
        workspace_id: row.workspaceId,
        name: row.name,
        created_by: row.createdBy,
        api_key_id: row.apiKeyId,
        idempotency_key: row.idempotencyKey,
        idempotency_fingerprint: row.idempotencyFingerprint,
        rescreen_of: row.rescreenOf,
        input_json: JSON.stringify(row.input),
        result_json: JSON.stringify(row.result),
        engine_version: row.engineVersion,
        route_label: row.routeLabel,
        aircraft_code: row.aircraftCode,
        flight_level: row.flightLevel,
        flight_date: row.flightDate,
        distance_km: row.distanceKm,
        fuel_kg: row.fuelKg,
        nox_total_kg: row.noxTotalKg,
        nox_above_kg: row.noxAboveTropopauseKg,
        fraction_above: row.fractionAboveTropopause,
        ozone_central_kg: row.ozoneLoss.centralKg,
        ozone_low_kg: row.ozoneLoss.lowKg,
        ozone_high_kg: row.ozoneLoss.highKg,
        created_at: row.createdAt,
      })
      .returning('id'),
  );
  const stored = await trx('screenings').where({ id }).first();
  return recordOf<I, R>(stored);
}

export async function getStoredScreening<I, R>(
  scope: { workspaceId: number },
  id: number,
): Promise<StoredScreening<I, R>> {
  const row = await db()('screenings').where({ workspace_id: scope.workspaceId, id }).first();
  if (!row) throw notFound('No screening with that id in this workspace.');
  return recordOf<I, R>(row);
}

/** Newer screenings made from this one with a later engine, newest first. */
export async function listRescreensOf(
  scope: { workspaceId: number },
  id: number,
): Promise<{ id: number; engineVersion: string; createdAt: string }[]> {
  const rows = (await db()('screenings')
    .where({ workspace_id: scope.workspaceId, rescreen_of: id })
    .orderBy('id', 'desc')
    .select('id', 'engine_version', 'created_at')) as Row[];
  return rows.map((r) => ({
    id: Number(r.id),
    engineVersion: String(r.engine_version),
    createdAt: String(r.created_at),
  }));
}

/** How many saved screenings of a workspace were made with each engine version. */
export async function countScreeningsByEngineVersion(scope: {
  workspaceId: number;
}): Promise<{ engineVersion: string; screenings: number }[]> {
  const rows = (await db()('screenings')
    .where({ workspace_id: scope.workspaceId })
    .groupBy('engine_version')
    .orderBy('engine_version')
    .select('engine_version')
    .count({ n: '*' })) as Row[];
  return rows.map((r) => ({ engineVersion: String(r.engine_version), screenings: Number(r.n) }));
}

export interface ScreeningFilters {
  from?: string;
  to?: string;
  route?: string;
  aircraft?: string;
  minShareAbove?: number;
  maxShareAbove?: number;
}

export const SUMMARY_COLUMNS = [
  'id',
  'name',
  'created_at',
  'route_label',
  'aircraft_code',
  'flight_level',
  'flight_date',
  'distance_km',
  'fuel_kg',
  'nox_total_kg',
  'nox_above_kg',
  'fraction_above',
  'ozone_central_kg',
  'ozone_low_kg',
  'ozone_high_kg',
  'engine_version',
];

/** Newest first, keyset-paged by id: `cursor` is the last id of the previous page. */
export async function listScreenings(
  scope: { workspaceId: number },
  opts: { cursor?: number; limit?: number; filters?: ScreeningFilters } = {},
): Promise<{ items: ScreeningSummary[]; nextCursor: string | null }> {
  const limit = Math.min(Math.max(opts.limit ?? 50, 1), 200);
  const q = db()('screenings')
    .where({ workspace_id: scope.workspaceId })
    .select(SUMMARY_COLUMNS)
    .orderBy('id', 'desc')
    .limit(limit + 1);
  if (opts.cursor) q.andWhere('id', '<', opts.cursor);
  const f = opts.filters ?? {};
  if (f.from) q.andWhere('created_at', '>=', f.from);
  if (f.to) q.andWhere('created_at', '<=', `${f.to}T23:59:59.999Z`);
  if (f.route) q.andWhereRaw('lower(route_label) like ?', [`%${f.route.toLowerCase().replace(/[%_]/g, '')}%`]);
  if (f.aircraft) q.andWhere('aircraft_code', f.aircraft);
  if (f.minShareAbove !== undefined) q.andWhere('fraction_above', '>=', f.minShareAbove);
  if (f.maxShareAbove !== undefined) q.andWhere('fraction_above', '<=', f.maxShareAbove);
  const rows = (await q) as Row[];
  const page = rows.slice(0, limit).map(summaryOf);
  return { items: page, nextCursor: rows.length > limit ? String(page[page.length - 1].id) : null };
}
