import 'server-only';
import type { Knex } from 'knex';
import { db } from './client';

/** Four values in the ICAO LTO mode order: idle 7 %, approach 30 %, climb-out 85 %, take-off 100 %. */
export type LtoQuad = [number, number, number, number];

export interface EngineDto {
  id: number;
  name: string;
  /** Certification fuel flow per engine, kg/s, idle -> take-off. */
  fuelFlowKgS: LtoQuad;
  /** Certification EI NOx, g NO2 per kg fuel, idle -> take-off. */
  eiNoxGPerKg: LtoQuad;
  source: string;
  isDemo: boolean;
  createdAt: string;
  updatedAt: string;
}

export interface AircraftTypeDto {
  id: number;
  code: string;
  name: string;
  engineId: number | null;
  engineName: string | null;
  engineCount: number;
  typicalMach: number;
  typicalFlightLevel: number;
  directEiGPerKg: number | null;
  defaultFleetId: number | null;
  defaultFleetName: string | null;
}

type Row = Record<string, unknown>;

export const engineOf = (r: Row): EngineDto => ({
  id: Number(r.id),
  name: String(r.name),
  fuelFlowKgS: [Number(r.ff_idle_kg_s), Number(r.ff_approach_kg_s), Number(r.ff_climb_out_kg_s), Number(r.ff_take_off_kg_s)],
  eiNoxGPerKg: [Number(r.ei_idle_g_kg), Number(r.ei_approach_g_kg), Number(r.ei_climb_out_g_kg), Number(r.ei_take_off_g_kg)],
  source: String(r.source ?? ''),
  isDemo: Boolean(r.is_demo),
  createdAt: String(r.created_at),
  updatedAt: String(r.updated_at),
});

const nullableNumber = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

export const aircraftTypeOf = (r: Row): AircraftTypeDto => ({
  id: Number(r.id),
  code: String(r.code),
  name: String(r.name ?? ''),
  engineId: nullableNumber(r.engine_id),
  engineName: (r.engine_name as string | null) ?? null,
  engineCount: Number(r.engine_count),
  typicalMach: Number(r.typical_mach),
  typicalFlightLevel: Number(r.typical_flight_level),
  directEiGPerKg: nullableNumber(r.direct_ei_g_kg),
  defaultFleetId: nullableNumber(r.default_fleet_id),
  defaultFleetName: (r.default_fleet_name as string | null) ?? null,
});

/** Engines of a workspace, by name. */
export async function listEngines(scope: { workspaceId: number }, trx: Knex | Knex.Transaction = db()): Promise<EngineDto[]> {
  const rows = await trx('engines').where({ workspace_id: scope.workspaceId }).orderBy('name', 'asc').orderBy('id', 'asc');
  return rows.map(engineOf);
}

export function aircraftTypeQuery(trx: Knex | Knex.Transaction, workspaceId: number): Knex.QueryBuilder {
  return trx('aircraft_types as a')
    .leftJoin('engines as e', 'e.id', 'a.engine_id')
    .leftJoin('fleets as f', 'f.id', 'a.default_fleet_id')
    .where('a.workspace_id', workspaceId)
    .select('a.*', 'e.name as engine_name', 'f.name as default_fleet_name');
}

/** Aircraft types of a workspace with their engine's and default fleet's names, by code. */
export async function listAircraftTypes(scope: { workspaceId: number }, trx: Knex | Knex.Transaction = db()): Promise<AircraftTypeDto[]> {
  const rows = (await aircraftTypeQuery(trx, scope.workspaceId).orderBy('a.code', 'asc')) as Row[];
  return rows.map(aircraftTypeOf);
}
