import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import { screenValidated, validateScreeningInput, type ScreeningInput } from '../lib/screening/index';
import { planRoute, pointOnLeg } from '../lib/screening/great-circle';
import { findAirport } from '../lib/screening/airports';
import { seededStamp } from '../lib/clock';

/**
 * A few invented flown tracks for the polar demo workspace's planned flights, so a flight page shows
 * planned vs flown: the three latest screened planned flights get a track that climbs out, cruises
 * 2 000 ft above the plan after the first third (as a crew might ask for) and descends, with a time
 * on every point at a steady 245 m/s and 3 % more fuel than planned. Invented, not recorded data.
 * Idempotent: the tracks form one import found again by its content's hash.
 */
const SLUG = 'skarn-polar';
const TRACKS = 3;
const SPACING_KM = 25;
const SPEED_KM_S = 0.245;

interface Planned {
  id: number;
  date: string;
  flight: string;
  origin: string;
  destination: string;
  aircraft_type_id: number;
  aircraft_code: string;
  fleet_id: number | null;
  cruise_fl: number;
  fuel_kg: number;
  input_json: string;
}

function trackOf(p: Planned): ScreeningInput {
  const a = findAirport(p.origin);
  const b = findAirport(p.destination);
  if (!a || !b) throw new Error(`demo track: unknown airport of ${p.flight}`);
  const plan = planRoute(Float64Array.of(a.lat, b.lat), Float64Array.of(a.lon, b.lon));
  const n = Math.max(20, Math.ceil(plan.totalKm / SPACING_KM) + 1);
  const t0 = Date.parse(`${p.date}T09:00:00Z`);
  const out = [0, 0];
  const points = [];
  for (let i = 0; i < n; i++) {
    const km = (plan.totalKm * i) / (n - 1);
    pointOnLeg(plan, 0, km, out);
    const cruise = km > plan.totalKm / 3 ? p.cruise_fl + 20 : p.cruise_fl;
    const climb = Math.min(1, km / 200, (plan.totalKm - km) / 200);
    points.push({
      time: new Date(t0 + Math.round((km / SPEED_KM_S) * 1000)).toISOString(),
      lat: Math.round(out[0] * 1e5) / 1e5,
      lon: Math.round(out[1] * 1e5) / 1e5,
      pressureAltitudeFt: Math.round(Math.max(0, cruise * climb) * 100),
    });
  }
  const planned = JSON.parse(p.input_json) as ScreeningInput;
  return validateScreeningInput({
    route: { track: { points } },
    fuelBurnKg: Math.round(p.fuel_kg * 1.03),
    emission: planned.emission,
    flightDate: p.date,
  });
}

export async function seed(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    const ws = await trx('workspaces').where({ slug: SLUG }).first('id');
    if (!ws) return;
    const workspaceId = Number(ws.id);
    const planned = (await trx('flights')
      .where({ workspace_id: workspaceId, basis: 'planned', status: 'screened' })
      .orderBy([
        { column: 'date', order: 'desc' },
        { column: 'flight', order: 'asc' },
      ])
      .limit(TRACKS)
      .select(
        'id',
        'date',
        'flight',
        'origin',
        'destination',
        'aircraft_type_id',
        'aircraft_code',
        'fleet_id',
        'cruise_fl',
        'fuel_kg',
        'input_json',
      )) as Planned[];
    if (!planned.length) return;
    const tracks = planned.map((p) => ({ p, input: trackOf(p) }));
    const fileHash = createHash('sha256')
      .update(JSON.stringify(tracks.map((t) => [t.p.flight, t.p.date, t.input])))
      .digest('hex');
    const stamp = seededStamp(planned[0].date, '20:00');
    let imp = await trx('imports').where({ workspace_id: workspaceId, file_hash: fileHash }).first('id');
    if (!imp) {
      const [id] = await trx('imports')
        .insert({
          workspace_id: workspaceId,
          kind: 'tracks',
          file_name: `${SLUG}-flown-tracks.csv`,
          file_hash: fileHash,
          status: 'complete',
          rows: tracks.length,
          rows_done: tracks.length,
          rate_base_rows: 0,
          created_at: stamp,
          started_at: stamp,
          finished_at: stamp,
          heartbeat_at: stamp,
        })
        .returning('id');
      imp = { id: typeof id === 'object' ? id.id : id };
    }
    const importId = Number(imp.id);
    for (const [i, { p, input }] of tracks.entries()) {
      const r = screenValidated(input);
      const levels = r.track?.levels ?? [p.cruise_fl];
      const screenedAt = seededStamp(p.date, '20:00');
      await trx('flights')
        .insert({
          workspace_id: workspaceId,
          import_id: importId,
          basis: 'flown',
          date: p.date,
          flight: p.flight,
          origin: p.origin,
          destination: p.destination,
          aircraft_type_id: p.aircraft_type_id,
          aircraft_code: p.aircraft_code,
          fleet_id: p.fleet_id,
          cruise_fl: p.cruise_fl,
          max_fl: Math.max(...levels),
          input_json: JSON.stringify(input),
          status: 'screened',
          fuel_kg: input.fuelBurnKg,
          source_line: i + 2,
          distance_km: r.distanceKm,
          nox_total_kg: r.noxTotalKg,
          nox_above_kg: r.noxAboveTropopauseKg,
          fraction_above: r.fractionAboveTropopause,
          mean_depth_above_km: r.meanDepthAboveTropopauseKm,
          ozone_central_kg: r.ozoneLoss.centralKg,
          ozone_low_kg: r.ozoneLoss.lowKg,
          ozone_high_kg: r.ozoneLoss.highKg,
          engine_version: r.engineVersion,
          screened_at: screenedAt,
          created_at: stamp,
        })
        .onConflict(['workspace_id', 'basis', 'date', 'flight', 'origin', 'destination'])
        .ignore();
      const row = await trx('flights')
        .where({ workspace_id: workspaceId, basis: 'flown', date: p.date, flight: p.flight })
        .first('id');
      // The same ledger row the import worker writes: one unit per flown flight screened.
      await trx('usage_events')
        .insert({
          workspace_id: workspaceId,
          kind: 'imported_flight',
          source_id: row.id,
          idempotency_key: `tp-imported_flight-${row.id}`,
          quantity: 1,
          occurred_at: screenedAt,
        })
        .onConflict(['kind', 'source_id'])
        .ignore();
    }
  });
}
