import 'server-only';
import { db, insertId, nowIso, writeTx } from './client';
import { recordUsage } from './usage';
import { assertBillingAllows } from '@/lib/billing/gate';
import type { ScreeningInput } from '@/lib/validation/screening';
import type { ScreeningResult } from '@/lib/screening';
import { AppError, notFound } from '@/lib/errors';

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

export interface ScreeningRecord {
  id: number;
  name: string;
  createdAt: string;
  aircraftCode: string | null;
  input: ScreeningInput;
  result: ScreeningResult;
  /** The engine version the saved figures were made with (the stored column, not today's engine). */
  engineVersion: string;
  /** The screening this one re-made with a newer engine, if it is a re-screen. */
  rescreenOf: number | null;
}

/** "EGLL → KSFO", or coordinates for points that are not airports. */
export function routeLabel(input: ScreeningInput): string {
  if ('flightPlan' in input.route)
    return `${input.route.flightPlan.from.toUpperCase()} → ${input.route.flightPlan.to.toUpperCase()} (flight plan)`;
  if ('track' in input.route) {
    const pts = input.route.track.points;
    const at = (p: { lat: number; lon: number }) => `${p.lat.toFixed(1)},${p.lon.toFixed(1)}`;
    return `${at(pts[0])} → ${at(pts[pts.length - 1])} (track, ${pts.length} points)`;
  }
  const pts = input.route.waypoints;
  const label = (w: (typeof pts)[number]) =>
    'airport' in w ? w.airport.toUpperCase() : `${w.lat.toFixed(1)},${w.lon.toFixed(1)}`;
  const first = pts[0];
  const last = pts[pts.length - 1];
  return pts.length > 2
    ? `${label(first)} → ${label(last)} (${pts.length - 2} via)`
    : `${label(first)} → ${label(last)}`;
}

function firstLevel(input: ScreeningInput): number {
  return 'flightLevel' in input.cruise ? input.cruise.flightLevel : input.cruise.steps[0].flightLevel;
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

const recordOf = (r: Row): ScreeningRecord => ({
  id: Number(r.id),
  name: String(r.name),
  createdAt: String(r.created_at),
  aircraftCode: (r.aircraft_code as string | null) ?? null,
  input: JSON.parse(String(r.input_json)) as ScreeningInput,
  result: JSON.parse(String(r.result_json)) as ScreeningResult,
  engineVersion: String(r.engine_version),
  rescreenOf: r.rescreen_of === null || r.rescreen_of === undefined ? null : Number(r.rescreen_of),
});

/**
 * Stores a screening and its billable unit in one transaction. With an idempotency key, a repeat
 * returns the first screening (`replayed: true`) and adds no unit.
 */
export async function createScreening(
  scope: { workspaceId: number },
  input: {
    name?: string;
    aircraftCode?: string | null;
    screening: ScreeningInput;
    result: ScreeningResult;
    createdBy: number | null;
    apiKeyId: number | null;
    idempotencyKey?: string | null;
    /** Fingerprint of the request body the key came with; a repeat of the key with another body is a 409. */
    idempotencyFingerprint?: string | null;
    /** Set for a re-screen: the older screening this one re-makes. Such a screening is not billed. */
    rescreenOf?: number | null;
  },
): Promise<{ record: ScreeningRecord; replayed: boolean }> {
  return writeTx(async (trx) => {
    if (input.idempotencyKey) {
      const prior = await trx('screenings')
        .where({ workspace_id: scope.workspaceId, idempotency_key: input.idempotencyKey })
        .first();
      if (prior) {
        const fp = prior.idempotency_fingerprint as string | null;
        if (fp && input.idempotencyFingerprint && fp !== input.idempotencyFingerprint) {
          throw new AppError(
            'conflict',
            `The Idempotency-Key "${input.idempotencyKey}" was already used with a different request body (screening #${prior.id}). Send the same body to get that screening again, or use a new key for a new screening.`,
            {
              fields: [
                { path: 'Idempotency-Key', message: `Already used with a different body for screening #${prior.id}.` },
              ],
              extra: { idempotencyKey: input.idempotencyKey, screeningId: Number(prior.id) },
            },
          );
        }
        return { record: recordOf(prior), replayed: true };
      }
    }
    const rescreenOf = input.rescreenOf ?? null;
    if (rescreenOf !== null) {
      const prior = await trx('screenings')
        .where({ workspace_id: scope.workspaceId, rescreen_of: rescreenOf, engine_version: input.result.engineVersion })
        .first();
      if (prior) return { record: recordOf(prior), replayed: true };
    } else {
      await assertBillingAllows(scope, trx);
    }
    const now = nowIso();
    const label = routeLabel(input.screening);
    const r = input.result;
    const id = await insertId(
      trx('screenings')
        .insert({
          workspace_id: scope.workspaceId,
          name: (input.name?.trim() || label).slice(0, 160),
          created_by: input.createdBy,
          api_key_id: input.apiKeyId,
          idempotency_key: input.idempotencyKey ?? null,
          idempotency_fingerprint: input.idempotencyKey ? (input.idempotencyFingerprint ?? null) : null,
          rescreen_of: rescreenOf,
          input_json: JSON.stringify(input.screening),
          result_json: JSON.stringify(r),
          engine_version: r.engineVersion,
          route_label: label,
          aircraft_code: input.aircraftCode ?? null,
          flight_level: firstLevel(input.screening),
          flight_date: input.screening.flightDate ?? null,
          distance_km: r.distanceKm,
          fuel_kg: r.fuelKg,
          nox_total_kg: r.noxTotalKg,
          nox_above_kg: r.noxAboveTropopauseKg,
          fraction_above: r.fractionAboveTropopause,
          ozone_central_kg: r.ozoneLoss.centralKg,
          ozone_low_kg: r.ozoneLoss.lowKg,
          ozone_high_kg: r.ozoneLoss.highKg,
          created_at: now,
        })
        .returning('id'),
    );
    // A re-screen repeats work already billed once (the source screening's unit): it records no unit
    // and passes no billing gate. The ledger's (kind, source_id) key could not catch it, since the
    // re-screen is a new screening id; this branch is what keeps it free.
    if (rescreenOf === null)
      await recordUsage(trx, { workspaceId: scope.workspaceId, kind: 'screening', sourceId: id, occurredAt: now });
    const row = await trx('screenings').where({ id }).first();
    return { record: recordOf(row), replayed: false };
  });
}

export async function getScreening(scope: { workspaceId: number }, id: number): Promise<ScreeningRecord> {
  const row = await db()('screenings').where({ workspace_id: scope.workspaceId, id }).first();
  if (!row) throw notFound('No screening with that id in this workspace.');
  return recordOf(row);
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
