import 'server-only';
import type { Knex } from 'knex';
import { db } from './client';
import { ltoOf, type LtoQuad } from './engines';

/** An aircraft type's emission block, in the engine input's shape: engine certification data, or a direct EI. */
export type AircraftEmission =
  | { engine: { fuelFlowKgS: LtoQuad; eiNoxGPerKg: LtoQuad }; engineCount: number; mach: number }
  | { eiNoxGPerKg: number };

export interface AircraftForScreening {
  id: number;
  code: string;
  engineCount: number;
  typicalMach: number;
  typicalFlightLevel: number;
  defaultFleetId: number | null;
  /** The emission block a screening uses for this type: engine certification data, or its direct EI. */
  emission: AircraftEmission | null;
}

/** Aircraft types of a workspace with what screening needs of each, keyed by upper-case code. */
export async function listAircraftForScreening(
  scope: { workspaceId: number },
  trx: Knex | Knex.Transaction = db(),
): Promise<Map<string, AircraftForScreening>> {
  const rows = await trx('aircraft_types as a')
    .leftJoin('engines as e', 'e.id', 'a.engine_id')
    .where('a.workspace_id', scope.workspaceId)
    .select(
      'a.*',
      'e.ff_idle_kg_s',
      'e.ff_approach_kg_s',
      'e.ff_climb_out_kg_s',
      'e.ff_take_off_kg_s',
      'e.ei_idle_g_kg',
      'e.ei_approach_g_kg',
      'e.ei_climb_out_g_kg',
      'e.ei_take_off_g_kg',
      'e.id as eid',
    );
  const out = new Map<string, AircraftForScreening>();
  for (const r of rows) {
    let emission: AircraftForScreening['emission'] = null;
    if (r.eid) {
      emission = {
        engine: ltoOf(r),
        engineCount: Number(r.engine_count),
        mach: Number(r.typical_mach),
      };
    } else if (r.direct_ei_g_kg !== null && r.direct_ei_g_kg !== undefined) {
      emission = { eiNoxGPerKg: Number(r.direct_ei_g_kg) };
    }
    out.set(String(r.code).toUpperCase(), {
      id: Number(r.id),
      code: r.code,
      engineCount: Number(r.engine_count),
      typicalMach: Number(r.typical_mach),
      typicalFlightLevel: Number(r.typical_flight_level),
      defaultFleetId: r.default_fleet_id === null ? null : Number(r.default_fleet_id),
      emission,
    });
  }
  return out;
}

export async function getAircraftForScreening(
  scope: { workspaceId: number },
  code: string,
): Promise<AircraftForScreening | null> {
  return (await listAircraftForScreening(scope)).get(code.trim().toUpperCase()) ?? null;
}
