import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import {
  encodeFlightComponents,
  findAirport,
  flightComponents,
  screenValidated,
  validateScreeningInput,
  type ScreeningInput,
} from '../lib/screening/index';
import { seededStamp, todayIso } from '../lib/clock';
import { seededRandom } from '../lib/random';
import { rebuildFlightRollups } from '../db/flight-rollups';
import { queryAircraftForScreening, type AircraftForScreening } from '../db/aircraft-for-screening';

/**
 * Demo flights (invented schedules of the invented demo operators) over the three calendar months
 * up to "today" (todayIso(), pinned by DEMO_TODAY), already screened, with one usage unit each, so
 * the flights, fleets and reports pages have data right after `npm run demo`. Each month's flights
 * come as one completed schedule import. Deterministic for a given day: every figure derives from
 * the flight's own key. Idempotent: flights are unique by (workspace, date, flight, origin,
 * destination) and imports by their file hash, so a re-run leaves the same rows.
 */

interface RouteSeed {
  flight: string;
  origin: string;
  destination: string;
  aircraft: string;
  /** The route flies on days where (day number + offset) % every === 0. */
  every: number;
  offset: number;
  /** Initial cruise level and the levels of later steps (fractions of the route). */
  levels: number[];
  /** Cruise fuel per great-circle km (demo values sized for each invented type). */
  fuelKgPerKm: number;
}

/** A route seed as one table row: flight, origin, destination, aircraft, every, offset, levels, fuel per km. */
type RouteRow = [string, string, string, string, number, number, number[], number];

const routes = (rows: RouteRow[]): RouteSeed[] =>
  rows.map(([flight, origin, destination, aircraft, every, offset, levels, fuelKgPerKm]) => ({
    flight,
    origin,
    destination,
    aircraft,
    every,
    offset,
    levels,
    fuelKgPerKm,
  }));

const SCHEDULES: Record<string, RouteSeed[]> = {
  'skarn-polar': routes([
    ['SKP101', 'EFHK', 'RJAA', 'SK-LR1', 3, 0, [350, 370, 390], 6.3],
    ['SKP102', 'RJAA', 'EFHK', 'SK-LR1', 3, 1, [340, 360, 380], 6.4],
    ['SKP211', 'EGLL', 'KSEA', 'SK-LR2', 4, 0, [350, 370, 390, 410], 7.0],
    ['SKP212', 'KSEA', 'EGLL', 'SK-LR2', 4, 2, [360, 380, 400], 7.0],
    ['SKP305', 'ENGM', 'CYVR', 'SK-LR1', 5, 1, [330, 350, 370], 6.2],
    ['SKP306', 'CYVR', 'ENGM', 'SK-LR1', 5, 3, [340, 360, 380], 6.2],
    ['SKP417', 'BIKF', 'PANC', 'SK-LR2', 6, 2, [370, 390], 7.2],
    ['SKP418', 'PANC', 'BIKF', 'SK-LR2', 6, 5, [380, 400], 7.2],
    ['SKP521', 'ESSA', 'RJTT', 'SK-LR2', 7, 4, [350, 370, 390, 410], 7.1],
  ]),
  'velloway-jets': routes([
    ['VWJ10', 'KTEB', 'EGGW', 'VJ-50', 6, 0, [430, 470, 490], 1.85],
    ['VWJ11', 'EGGW', 'KTEB', 'VJ-50', 6, 3, [430, 450, 470], 1.9],
    ['VWJ22', 'LFPB', 'KVNY', 'VJ-50', 9, 2, [450, 490, 510], 1.8],
    ['VWJ23', 'KVNY', 'LFPB', 'VJ-50', 9, 6, [450, 470, 490], 1.8],
    ['VWJ31', 'KPBI', 'KTEB', 'VJ-50', 5, 1, [450], 2.1],
    ['VWJ40', 'LSGG', 'OMDB', 'VJ-50', 8, 4, [430, 470], 1.95],
    ['VWJ41', 'OMDB', 'LSGG', 'VJ-50', 8, 7, [450, 490], 1.95],
  ]),
  'kestrel-mach': routes([
    ['KMS1', 'EGLL', 'KJFK', 'KM-SST', 7, 0, [550, 580, 600], 9.2],
    ['KMS2', 'KJFK', 'EGLL', 'KM-SST', 7, 2, [550, 570, 590], 9.2],
    ['KMS5', 'KSFO', 'PHNL', 'KM-SST', 10, 3, [560, 600], 9.0],
    ['KMS6', 'PHNL', 'KSFO', 'KM-SST', 10, 6, [560, 590], 9.0],
  ]),
};

const CSV_HEADER = 'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg,steps,fleet,ei_nox_g_per_kg,mach';

/** The shared seeded generator, seeded from the flight's key. */
function random(key: string): () => number {
  return seededRandom(createHash('sha256').update(key).digest().readUInt32LE(0));
}

function greatCircleKm(a: { lat: number; lon: number }, b: { lat: number; lon: number }): number {
  const r = Math.PI / 180;
  const s =
    Math.sin(((b.lat - a.lat) * r) / 2) ** 2 +
    Math.cos(a.lat * r) * Math.cos(b.lat * r) * Math.sin(((b.lon - a.lon) * r) / 2) ** 2;
  return 2 * 6371.0088 * Math.asin(Math.sqrt(s));
}

const addDays = (day: string, n: number): string =>
  new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** The first day of the month two months before `today`, so the period covers three calendar months. */
function periodStart(today: string): string {
  const [y, m] = today.split('-').map(Number);
  const d = new Date(Date.UTC(y, m - 3, 1));
  return d.toISOString().slice(0, 10);
}

interface DemoFlight {
  date: string;
  flight: string;
  origin: string;
  destination: string;
  type: AircraftForScreening;
  cruiseFl: number;
  maxFl: number;
  fuelKg: number;
  steps: { fromKm: number; flightLevel: number }[];
  input: ScreeningInput;
}

function buildFlights(slug: string, types: Map<string, AircraftForScreening>, from: string, to: string): DemoFlight[] {
  const out: DemoFlight[] = [];
  const epoch = Date.parse('2026-01-01T00:00:00Z');
  for (let day = from; day <= to; day = addDays(day, 1)) {
    const dayNumber = Math.round((Date.parse(`${day}T00:00:00Z`) - epoch) / 86_400_000);
    for (const r of SCHEDULES[slug] ?? []) {
      if ((dayNumber + r.offset) % r.every !== 0) continue;
      const type = types.get(r.aircraft);
      const a = findAirport(r.origin);
      const b = findAirport(r.destination);
      if (!type?.emission || !a || !b) continue;
      const rnd = random(`${slug}|${day}|${r.flight}`);
      const km = greatCircleKm(a, b);
      // On some days the flight is cleared straight to its second level.
      const skip = rnd() < 0.2 ? 1 : 0;
      const levels = r.levels.slice(skip === 1 && r.levels.length > 2 ? 1 : 0);
      const steps = levels.map((fl, i) => ({
        fromKm: i === 0 ? 0 : Math.round((km * (i / levels.length) * (0.85 + 0.3 * rnd())) / 10) * 10,
        flightLevel: fl,
      }));
      const fuelKg = Math.round((km * r.fuelKgPerKm * (0.95 + 0.1 * rnd())) / 10) * 10;
      const raw = {
        route: { waypoints: [{ airport: r.origin }, { airport: r.destination }] },
        cruise: steps.length > 1 ? { steps } : { flightLevel: steps[0].flightLevel },
        mach: type.typicalMach,
        fuelBurnKg: fuelKg,
        emission: type.emission,
        flightDate: day,
      };
      out.push({
        date: day,
        flight: r.flight,
        origin: r.origin,
        destination: r.destination,
        type,
        cruiseFl: steps[0].flightLevel,
        maxFl: Math.max(...steps.map((s) => s.flightLevel)),
        fuelKg,
        steps,
        input: validateScreeningInput(raw),
      });
    }
  }
  return out;
}

function csvOf(flights: DemoFlight[]): string {
  const lines = flights.map((f) =>
    [
      f.date,
      f.flight,
      f.origin,
      f.destination,
      f.type.code,
      String(f.cruiseFl),
      String(f.fuelKg),
      f.steps.length > 1 ? f.steps.map((s) => `${s.flightLevel}@${s.fromKm}`).join(' ') : '',
      '',
      '',
      '',
    ].join(','),
  );
  return [CSV_HEADER, ...lines].join('\r\n') + '\r\n';
}

export async function seed(knex: Knex): Promise<void> {
  const today = todayIso();
  const from = periodStart(today);
  await knex.transaction(async (trx) => {
    for (const slug of Object.keys(SCHEDULES)) {
      const ws = await trx('workspaces').where({ slug }).first('id');
      if (!ws) continue;
      const workspaceId = Number(ws.id);
      const uploader = await trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where('m.workspace_id', workspaceId)
        .whereIn('m.role', ['analyst', 'owner'])
        .orderByRaw("case when m.role = 'analyst' then 0 else 1 end")
        .first('u.id');
      const types = await queryAircraftForScreening(trx, workspaceId);
      const flights = buildFlights(slug, types, from, today);
      const months = [...new Set(flights.map((f) => f.date.slice(0, 7)))].sort();
      for (const month of months) {
        const batch = flights.filter((f) => f.date.startsWith(month));
        const csv = csvOf(batch);
        const fileHash = createHash('sha256').update(csv).digest('hex');
        const last = batch[batch.length - 1].date;
        const stamp = seededStamp(last, '18:00');
        let imp = await trx('imports').where({ workspace_id: workspaceId, file_hash: fileHash }).first('id');
        if (!imp) {
          const [id] = await trx('imports')
            .insert({
              workspace_id: workspaceId,
              kind: 'schedule',
              file_name: `${slug}-schedule-${month}.csv`,
              file_hash: fileHash,
              status: 'queued',
              rows: batch.length,
              rows_done: 0,
              rate_base_rows: 0,
              created_by: uploader ? uploader.id : null,
              created_at: stamp,
            })
            .returning('id');
          imp = { id: typeof id === 'object' ? id.id : id };
        }
        const importId = Number(imp.id);
        for (let i = 0; i < batch.length; i += 200) {
          await trx('flights')
            .insert(
              batch.slice(i, i + 200).map((f, j) => ({
                workspace_id: workspaceId,
                import_id: importId,
                date: f.date,
                flight: f.flight,
                origin: f.origin,
                destination: f.destination,
                aircraft_type_id: f.type.id,
                aircraft_code: f.type.code,
                fleet_id: f.type.defaultFleetId,
                cruise_fl: f.cruiseFl,
                max_fl: f.maxFl,
                input_json: JSON.stringify(f.input),
                status: 'pending',
                fuel_kg: f.fuelKg,
                source_line: i + j + 2,
                created_at: stamp,
              })),
            )
            .onConflict(['workspace_id', 'basis', 'date', 'flight', 'origin', 'destination'])
            .ignore();
        }
        const pending = await trx('flights')
          .where({ import_id: importId, status: 'pending' })
          .select('id', 'date', 'input_json');
        for (const p of pending) {
          const input = JSON.parse(p.input_json) as ScreeningInput;
          const r = screenValidated(input);
          const screenedAt = seededStamp(p.date, '12:00');
          await trx('flights').where({ id: p.id }).update({
            status: 'screened',
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
          });
          // The fleet-sampling components the import worker keeps (db/flight-components.ts).
          await trx('flight_components')
            .insert({
              flight_id: p.id,
              workspace_id: workspaceId,
              engine_version: r.engineVersion,
              data: Buffer.from(encodeFlightComponents(flightComponents(input, r))),
            })
            .onConflict('flight_id')
            .merge(['engine_version', 'data']);
          // The same ledger row db/usage.ts recordUsage writes (seeds cannot import server-only modules).
          await trx('usage_events')
            .insert({
              workspace_id: workspaceId,
              kind: 'imported_flight',
              source_id: p.id,
              idempotency_key: `tp-imported_flight-${p.id}`,
              quantity: 1,
              occurred_at: screenedAt,
            })
            .onConflict(['kind', 'source_id'])
            .ignore();
        }
        const done = Number(
          ((await trx('flights').where({ import_id: importId }).count({ n: '*' }).first()) as { n: number }).n,
        );
        await trx('imports').where({ id: importId }).update({
          status: 'complete',
          rows: done,
          rows_done: done,
          started_at: stamp,
          finished_at: stamp,
          heartbeat_at: stamp,
          rate_since: stamp,
          rate_base_rows: 0,
        });
      }
      await rebuildFlightRollups(trx, workspaceId);
    }
  });
}
