/**
 * Fleet percentiles (issue 12, item 6, engine part): 400 samples of a 100 000-flight fleet from the
 * flights' components (weighted sums, no re-screening). The components of 500 distinct synthetic
 * flights are built and timed (that cost belongs to screening each flight once), then repeated to
 * 100 000 flights for the sampling time. Invented routes and an invented engine.
 *
 * Then the product path: the same 100 000 flights stored with their components in a fresh migrated
 * SQLite file, and `fleetPercentiles` timed from the database (flight set, component reads, decoding,
 * sampling, storing the result), cold and then with the result stored.
 *
 * Run: node --conditions=react-server --import tsx tests/bench/fleet-uncertainty.ts [flights]
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { mulberry32 } from '../../lib/screening/prng';
import {
  encodeFlightComponents,
  flightComponents,
  sampleFleet,
  type FlightComponents,
} from '../../lib/screening/fleet-uncertainty';
import { ENGINE_VERSION, screenValidated, validateScreeningInput } from '../../lib/screening/index';

const FLIGHTS = Number(process.argv[2] ?? 100_000);
const DISTINCT = 500;
const ENGINE = {
  fuelFlowKgS: [0.2, 0.6, 1.8, 2.2] as [number, number, number, number],
  eiNoxGPerKg: [5, 12, 28, 36] as [number, number, number, number],
};

const rnd = mulberry32(20_261_203);
const comps: FlightComponents[] = [];
let screenMs = 0;
let compMs = 0;
while (comps.length < DISTINCT) {
  const lat = (rnd() < 0.7 ? 1 : -1) * (25 + rnd() * 45);
  const lon = -170 + rnd() * 270;
  const input = validateScreeningInput({
    route: {
      waypoints: [
        { lat, lon },
        { lat: lat + (rnd() - 0.5) * 10, lon: lon + 10 + rnd() * 60 },
      ],
    },
    cruise: { flightLevel: 300 + Math.floor(rnd() * 13) * 10 },
    fuelBurnKg: 8000 + rnd() * 60_000,
    emission: rnd() < 0.5 ? { eiNoxGPerKg: 10 + rnd() * 10 } : { engine: ENGINE, engineCount: 2 },
    month: 1 + Math.floor(rnd() * 12),
  });
  let t = performance.now();
  let result;
  try {
    result = screenValidated(input);
  } catch {
    continue;
  }
  screenMs += performance.now() - t;
  t = performance.now();
  comps.push(flightComponents(input, result));
  compMs += performance.now() - t;
}
const fleet = Array.from({ length: FLIGHTS }, (_, i) => comps[i % DISTINCT]);
sampleFleet(fleet.slice(0, 1000), { samples: 50 });
const cpu = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};
const t = performance.now();
const c0 = cpu();
const r = sampleFleet(fleet, { samples: 400 });
const s = (performance.now() - t) / 1000;
console.log(
  `fleet percentiles: ${FLIGHTS} flights (${DISTINCT} distinct, repeated), 400 samples: ${s.toFixed(2)} s wall, ${(cpu() - c0).toFixed(2)} s CPU (target under 10 s; load average ${os.loadavg()[0].toFixed(1)} on ${os.availableParallelism()} cores)`,
);
console.log(
  `  components per flight ${(compMs / DISTINCT).toFixed(2)} ms beside its full screening ${(screenMs / DISTINCT).toFixed(2)} ms; about ${((FLIGHTS * 61 * 2 + FLIGHTS * 9) * 4) / 1e6} MB of components`,
);
console.log(
  `  ozone figure p5 ${(r.ozoneLossKg.p5 / 1000).toFixed(0)} t, p50 ${(r.ozoneLossKg.p50 / 1000).toFixed(0)} t, p95 ${(r.ozoneLossKg.p95 / 1000).toFixed(0)} t`,
);

// The product path, from a database.
const dir = process.env.KEEP_DIR ?? fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-fleet-bench-'));
process.env.SQLITE_FILE = path.join(dir, 'bench.sqlite');
const { db, closeDb } = await import('../../db/client');
const { fleetPercentiles } = await import('../../lib/fleets/percentiles');
try {
  const k = db();
  await k.migrate.latest();
  const now = new Date().toISOString();
  const [ws] = await k('workspaces').insert({ slug: 'bench', name: 'Bench', created_at: now }).returning('id');
  const workspaceId = Number(typeof ws === 'object' ? ws.id : ws);
  const fleetIds: number[] = [];
  for (const name of ['Fleet A', 'Fleet B', 'Fleet C']) {
    const [f] = await k('fleets').insert({ workspace_id: workspaceId, name, created_at: now }).returning('id');
    fleetIds.push(Number(typeof f === 'object' ? f.id : f));
  }
  const blobs = comps.map((c) => Buffer.from(encodeFlightComponents(c)));
  let t0 = performance.now();
  const BATCH = 500;
  for (let i = 0; i < FLIGHTS; i += BATCH) {
    const rows = [];
    for (let j = i; j < Math.min(FLIGHTS, i + BATCH); j++)
      rows.push({
        workspace_id: workspaceId,
        date: `2026-${String(1 + (j % 12)).padStart(2, '0')}-${String(1 + (j % 28)).padStart(2, '0')}`,
        flight: `B${j}`,
        origin: 'EGLL',
        destination: 'KJFK',
        aircraft_code: 'B-1',
        fleet_id: fleetIds[j % fleetIds.length],
        cruise_fl: 350,
        max_fl: 350,
        input_json: '{}',
        status: 'screened',
        fuel_kg: 30000,
        nox_above_kg: 1,
        nox_total_kg: 2,
        engine_version: ENGINE_VERSION,
        created_at: now,
      });
    const ids = (await k('flights').insert(rows).returning('id')) as (number | { id: number })[];
    await k('flight_components').insert(
      ids.map((r, n) => ({
        flight_id: Number(typeof r === 'object' ? r.id : r),
        workspace_id: workspaceId,
        engine_version: ENGINE_VERSION,
        data: blobs[(i + n) % DISTINCT],
      })),
    );
  }
  const storeS = (performance.now() - t0) / 1000;
  const scope = { workspaceId };
  const filters = { from: '2026-01-01', to: '2026-12-31' };
  t0 = performance.now();
  let c1 = cpu();
  const cold = await fleetPercentiles(scope, filters);
  const coldS = (performance.now() - t0) / 1000;
  const coldCpu = cpu() - c1;
  t0 = performance.now();
  c1 = cpu();
  await fleetPercentiles(scope, filters);
  const warmS = (performance.now() - t0) / 1000;
  const warmCpu = cpu() - c1;
  console.log(
    `fleet percentiles from the database: ${FLIGHTS} stored flights in 3 fleets, 400 samples, each fleet and the total in one joint sampling: ${coldS.toFixed(2)} s wall / ${coldCpu.toFixed(2)} s CPU cold (flight set, component reads and decoding, sampling, storing the result), ${warmS.toFixed(2)} s wall / ${warmCpu.toFixed(2)} s CPU with the result stored (target under 10 s; load average ${os.loadavg()[0].toFixed(1)})`,
  );
  console.log(
    `  storing ${FLIGHTS} flights with components took ${storeS.toFixed(1)} s; total ozone figure p50 ${((cold && 'total' in cold ? cold.total.ozoneLossKg.p50 : 0) / 1000).toFixed(0)} t`,
  );
} finally {
  await closeDb();
  if (!process.env.KEEP_DIR) fs.rmSync(dir, { recursive: true, force: true });
}
