import { db } from '@/db/client';
import { adjustFlightRollups } from '@/db/flight-rollups';

const NOW = '2026-11-01T00:00:00.000Z';

export async function insertFleet(workspaceId: number, name: string): Promise<number> {
  const [id] = await db()('fleets')
    .insert({ workspace_id: workspaceId, name, description: '', created_at: NOW })
    .returning('id');
  return typeof id === 'object' ? Number(id.id) : Number(id);
}

export async function insertType(workspaceId: number, code: string, defaultFleetId: number | null): Promise<number> {
  const [id] = await db()('aircraft_types')
    .insert({
      workspace_id: workspaceId,
      code,
      name: code,
      engine_count: 2,
      typical_mach: 0.84,
      typical_flight_level: 370,
      direct_ei_g_kg: 14,
      default_fleet_id: defaultFleetId,
      created_at: NOW,
      updated_at: NOW,
    })
    .returning('id');
  return typeof id === 'object' ? Number(id.id) : Number(id);
}

export interface FlightFixture {
  date: string;
  flight: string;
  origin?: string;
  destination?: string;
  typeId: number;
  code: string;
  fleetId?: number | null;
  cruiseFl?: number;
  maxFl?: number;
  distanceKm: number;
  fuelKg: number;
  noxKg: number;
  noxAboveKg: number;
  ozone?: [number, number, number];
  status?: string;
}

let seq = 0;

/** A screened flight row with known summary figures and its roll-up, exactly as the import worker leaves them. */
export async function insertFlight(workspaceId: number, f: FlightFixture): Promise<number> {
  seq += 1;
  const [central, low, high] = f.ozone ?? [f.noxAboveKg * 0.5, f.noxAboveKg * 0.1, f.noxAboveKg * 2];
  const [id] = await db()('flights')
    .insert({
      workspace_id: workspaceId,
      date: f.date,
      flight: `${f.flight}${seq}`.slice(0, 16),
      origin: f.origin ?? 'EGLL',
      destination: f.destination ?? 'KSFO',
      aircraft_type_id: f.typeId,
      aircraft_code: f.code,
      fleet_id: f.fleetId ?? null,
      cruise_fl: f.cruiseFl ?? 370,
      max_fl: f.maxFl ?? f.cruiseFl ?? 370,
      input_json: '{}',
      status: f.status ?? 'screened',
      distance_km: f.distanceKm,
      fuel_kg: f.fuelKg,
      nox_total_kg: f.noxKg,
      nox_above_kg: f.noxAboveKg,
      fraction_above: f.noxKg > 0 ? f.noxAboveKg / f.noxKg : 0,
      mean_depth_above_km: 0.5,
      ozone_central_kg: central,
      ozone_low_kg: low,
      ozone_high_kg: high,
      engine_version: '2026.12.1',
      screened_at: NOW,
      created_at: NOW,
    })
    .returning('id');
  const flightId = typeof id === 'object' ? Number(id.id) : Number(id);
  // The worker keeps the monthly roll-ups in the transaction that screens a flight; so does this row.
  await adjustFlightRollups(db(), (q) => q.where('id', flightId), 1);
  return flightId;
}
