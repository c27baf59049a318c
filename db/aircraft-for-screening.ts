import type { Knex } from 'knex';

/**
 * What screening needs of a workspace's aircraft types (engine certification data or a direct EI).
 * No `server-only` here: the demo seeds read it too (`db/aircraft-lookup.ts` is the app's door).
 */

/** Four values in the ICAO LTO mode order: idle 7 %, approach 30 %, climb-out 85 %, take-off 100 %. */
export type LtoQuad = [number, number, number, number];

type Row = Record<string, unknown>;

/** An engine row's four LTO-mode fuel flows (kg/s) and EI NOx (g/kg), idle first. */
export const ltoOf = (r: Row): { fuelFlowKgS: LtoQuad; eiNoxGPerKg: LtoQuad } => ({
  fuelFlowKgS: [
    Number(r.ff_idle_kg_s),
    Number(r.ff_approach_kg_s),
    Number(r.ff_climb_out_kg_s),
    Number(r.ff_take_off_kg_s),
  ],
  eiNoxGPerKg: [
    Number(r.ei_idle_g_kg),
    Number(r.ei_approach_g_kg),
    Number(r.ei_climb_out_g_kg),
    Number(r.ei_take_off_g_kg),
  ],
});

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
export async function queryAircraftForScreening(
  trx: Knex | Knex.Transaction,
  workspaceId: number,
): Promise<Map<string, AircraftForScreening>> {
  const rows = await trx('aircraft_types as a')
    .leftJoin('engines as e', 'e.id', 'a.engine_id')
    .where('a.workspace_id', workspaceId)
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
