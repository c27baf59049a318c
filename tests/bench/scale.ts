/**
 * `npm run bench:scale`: a workspace with a year of a large carrier (1 000 000 screened flights over
 * the 12 months up to DEMO_TODAY, in `skarn-polar` of the demo), on SQLite and, when Debian's
 * PostgreSQL is installed, on PostgreSQL; then, through the built app on 127.0.0.1: the fleet
 * comparison for the year (API and page), the overview, the flights list (first page and a deep one,
 * page and API), a fleet report (build, PDF, CSV), and the web server's peak memory. The comparison
 * with a route filter is timed too: the roll-ups keep no airports, so it still sums the flight rows. Figures beside
 * the targets (comparison and overview under 1 s, list pages under 200 ms, report under 15 s, server
 * RSS under 800 MB); never pass or fail.
 *
 * The flights are not screened one by one: a few hundred templates (invented rotations between real
 * airports, one per route and month) are screened with the engine, and each flight copies its
 * template's figures with its own date, flight number, type and fleet. Rows go in by bulk inserts in
 * transactions; the monthly roll-ups are rebuilt once at the end (db/flight-rollups.ts).
 *
 * Options: --flights N (default 1 000 000), --db sqlite|pg|both (default both), --runs N (timed
 * requests per figure, default 5). BENCH_BUILD=1 rebuilds the app (into `.next-bench`, dist-dir.ts);
 * without a build there it builds first.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import Database from 'better-sqlite3';
import knexFactory, { type Knex } from 'knex';
import { appEnv, build, hasBuild, prepareDatabase, startApp, tempDir, type RunningApp } from '../soak/app-process';
import { freePort } from '../support/free-port';
import { sessionCookie } from '../support/session-cookie';
import { pgBinDir, startScratchPostgres } from '../support/scratch-postgres';
import { BENCH_DIST_DIR, benchNextEnv } from './dist-dir';
import { rebuildFlightRollups } from '../../db/flight-rollups';
import { PENDING_FLIGHT_COLUMNS } from '../../db/flight-columns';
import { screenTotals, validateScreeningInput, type ScreeningInput } from '../../lib/screening/index';

const arg = (name: string, fallback: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
};
const FLIGHTS = Number(arg('flights', '1000000').replace(/[_ ]/g, ''));
const WHICH = arg('db', 'both');
const RUNS = Number(arg('runs', '5'));
const SLUG = 'skarn-polar';
const TODAY = process.env.DEMO_TODAY ?? '2026-11-20';
const SECRET = 'bench-secret-0123456789-abcdefghijkl';

/** The 12 whole months up to and including TODAY's month. */
function yearMonths(): string[] {
  const [y, m] = TODAY.split('-').map(Number);
  const out: string[] = [];
  for (let i = 11; i >= 0; i--) out.push(new Date(Date.UTC(y, m - 1 - i, 1)).toISOString().slice(0, 7));
  return out;
}
const MONTHS = yearMonths();
const daysIn = (month: string) => {
  const [y, m] = month.split('-').map(Number);
  return new Date(Date.UTC(y, m, 0)).getUTCDate();
};
const YEAR = { from: `${MONTHS[0]}-01`, to: `${MONTHS[11]}-${daysIn(MONTHS[11])}` };

const ROUTES: [string, string, number, number][] = [
  ['EGLL', 'KJFK', 370, 62_000],
  ['EFHK', 'RJTT', 380, 78_000],
  ['ENGM', 'KSEA', 360, 70_000],
  ['BIKF', 'CYYZ', 350, 38_000],
  ['EKCH', 'PANC', 380, 64_000],
  ['ESSA', 'KORD', 370, 66_000],
  ['EHAM', 'CYVR', 390, 72_000],
  ['EDDF', 'RJAA', 370, 82_000],
  ['LFPG', 'KSFO', 380, 80_000],
  ['EGLL', 'ZBAA', 360, 74_000],
  ['EFHK', 'KJFK', 370, 60_000],
  ['ENGM', 'RKSI', 390, 84_000],
  ['EKCH', 'CYYZ', 350, 58_000],
  ['BIKF', 'KSEA', 360, 52_000],
  ['EGPH', 'KEWR', 340, 50_000],
  ['EDDM', 'CYUL', 350, 56_000],
  ['ESSA', 'RJTT', 400, 86_000],
  ['EHAM', 'PANC', 380, 66_000],
  ['LOWW', 'KORD', 360, 68_000],
  ['EPWA', 'CYYZ', 350, 60_000],
  ['EGLL', 'PHNL', 380, 98_000],
  ['EFHK', 'ZSPD', 370, 76_000],
  ['ENBR', 'KIAH', 360, 74_000],
  ['EKCH', 'KLAX', 390, 86_000],
  ['EIDW', 'KBOS', 340, 40_000],
];

interface Template {
  origin: string;
  destination: string;
  month: string;
  cruiseFl: number;
  maxFl: number;
  fuelKg: number;
  inputJson: string;
  f: {
    distanceKm: number;
    noxTotalKg: number;
    noxAboveKg: number;
    fractionAbove: number;
    meanDepthKm: number;
    o3: number;
    o3Low: number;
    o3High: number;
    version: string;
  };
}

/** One template per route and month, each screened once with the engine. */
function screenTemplates(): { templates: Template[]; ms: number } {
  const t0 = performance.now();
  const templates: Template[] = [];
  for (const month of MONTHS)
    for (const [i, [origin, destination, fl, fuelKg]] of ROUTES.entries()) {
      const stepped = i % 3 === 0;
      const input: ScreeningInput = validateScreeningInput({
        route: { waypoints: [{ airport: origin }, { airport: destination }] },
        cruise: stepped
          ? {
              steps: [
                { fromKm: 0, flightLevel: fl - 20 },
                { fromKm: 2500, flightLevel: fl },
              ],
            }
          : { flightLevel: fl },
        fuelBurnKg: fuelKg,
        emission: { eiNoxGPerKg: 12 + (i % 7) },
        flightDate: `${month}-15`,
      });
      const r = screenTotals(input);
      templates.push({
        origin,
        destination,
        month,
        cruiseFl: stepped ? fl - 20 : fl,
        maxFl: fl,
        fuelKg,
        inputJson: JSON.stringify(input),
        f: {
          distanceKm: r.distanceKm,
          noxTotalKg: r.noxTotalKg,
          noxAboveKg: r.noxAboveTropopauseKg,
          fractionAbove: r.fractionAboveTropopause,
          meanDepthKm: r.meanDepthAboveTropopauseKm,
          o3: r.ozoneLoss.centralKg,
          o3Low: r.ozoneLoss.lowKg,
          o3High: r.ozoneLoss.highKg,
          version: r.engineVersion,
        },
      });
    }
  return { templates, ms: performance.now() - t0 };
}

/** The pending-flight columns imports write, then the screened figures the bench copies from templates. */
const COLUMNS = [
  ...PENDING_FLIGHT_COLUMNS,
  'distance_km',
  'nox_total_kg',
  'nox_above_kg',
  'fraction_above',
  'mean_depth_above_km',
  'ozone_central_kg',
  'ozone_low_kg',
  'ozone_high_kg',
  'engine_version',
  'screened_at',
] as const;

interface Workspace {
  id: number;
  types: { id: number; code: string }[];
  fleets: number[];
  importOf: Map<string, number>;
}

/** Flight i: its template's route and month, its own day, flight number, type, fleet and fuel. */
function flightRow(i: number, ws: Workspace, templates: Template[]): (string | number | null)[] {
  const t = templates[i % templates.length];
  const day = 1 + (Math.floor(i / templates.length) % daysIn(t.month));
  const date = `${t.month}-${String(day).padStart(2, '0')}`;
  const type = ws.types[i % ws.types.length];
  const fleet = i % 5 === 0 ? ws.fleets[(i / 5) % ws.fleets.length] : null;
  const scale = 0.9 + ((i * 7919) % 201) / 1000;
  const f = t.f;
  const warning =
    i % 211 === 0 ? 'Fuel of this flight is unusually low for its distance (bench data, invented).' : null;
  const stamp = `${date}T12:00:00.000Z`;
  return [
    ws.id,
    ws.importOf.get(t.month) ?? null,
    date,
    `SB${i}`,
    t.origin,
    t.destination,
    type.id,
    type.code,
    fleet,
    t.cruiseFl,
    t.maxFl,
    t.inputJson,
    'screened',
    t.fuelKg * scale,
    i + 2,
    stamp,
    warning,
    f.distanceKm,
    f.noxTotalKg * scale,
    f.noxAboveKg * scale,
    f.fractionAbove,
    f.meanDepthKm,
    f.o3 * scale,
    f.o3Low * scale,
    f.o3High * scale,
    f.version,
    stamp,
  ];
}

/** The demo workspace's types, its fleets plus two made here, and one complete import per month. */
async function prepareWorkspace(k: Knex): Promise<Workspace> {
  const ws = (await k('workspaces').where({ slug: SLUG }).first('id')) as { id: number };
  const id = Number(ws.id);
  const now = new Date().toISOString();
  for (const name of ['Bench charter', 'Bench regional'])
    await k('fleets').insert({ workspace_id: id, name, description: 'bench data', created_at: now });
  const fleets = ((await k('fleets').where({ workspace_id: id }).orderBy('id').select('id')) as { id: number }[]).map(
    (r) => Number(r.id),
  );
  const types = (
    (await k('aircraft_types').where({ workspace_id: id }).orderBy('id').select('id', 'code')) as {
      id: number;
      code: string;
    }[]
  ).map((r) => ({ id: Number(r.id), code: String(r.code) }));
  const importOf = new Map<string, number>();
  for (const month of MONTHS) {
    const [row] = (await k('imports')
      .insert({
        workspace_id: id,
        kind: 'schedule',
        file_name: `bench-${month}.csv`,
        file_hash: `bench-${month}-${randomBytes(8).toString('hex')}`,
        status: 'complete',
        rows: 0,
        rows_done: 0,
        rate_base_rows: 0,
        created_at: `${month}-28T18:00:00.000Z`,
        finished_at: `${month}-28T18:00:00.000Z`,
      })
      .returning('id')) as ({ id: number } | number)[];
    importOf.set(month, typeof row === 'object' ? Number(row.id) : Number(row));
  }
  return { id, types, fleets, importOf };
}

async function finishWorkspace(k: Knex, ws: Workspace): Promise<number> {
  const t0 = performance.now();
  await k.transaction((trx) => rebuildFlightRollups(trx, ws.id));
  for (const [, importId] of ws.importOf) {
    const n = (await k('flights').where({ import_id: importId }).count({ n: '*' }).first()) as { n: number | string };
    await k('imports')
      .where({ id: importId })
      .update({ rows: Number(n.n), rows_done: Number(n.n) });
  }
  return performance.now() - t0;
}

const BATCH = 50_000;

function seedSqlite(file: string, ws: Workspace, templates: Template[]): number {
  const conn = new Database(file);
  conn.pragma('journal_mode = WAL');
  conn.pragma('synchronous = NORMAL');
  const stmt = conn.prepare(
    `INSERT INTO flights (${COLUMNS.join(', ')}) VALUES (${COLUMNS.map(() => '?').join(', ')})`,
  );
  const t0 = performance.now();
  const batch = conn.transaction((from: number, to: number) => {
    for (let i = from; i < to; i++) stmt.run(flightRow(i, ws, templates));
  });
  for (let i = 0; i < FLIGHTS; i += BATCH) {
    batch(i, Math.min(FLIGHTS, i + BATCH));
    if ((i / BATCH) % 4 === 3) process.stdout.write(`  ${Math.min(FLIGHTS, i + BATCH)} flights\n`);
  }
  conn.pragma('wal_checkpoint(TRUNCATE)');
  conn.exec('ANALYZE');
  conn.close();
  return performance.now() - t0;
}

async function seedPostgres(k: Knex, ws: Workspace, templates: Template[]): Promise<number> {
  const t0 = performance.now();
  const perStatement = Math.floor(60_000 / COLUMNS.length);
  const row = `(${COLUMNS.map(() => '?').join(', ')})`;
  for (let i = 0; i < FLIGHTS; i += BATCH) {
    await k.transaction(async (trx) => {
      for (let j = i; j < Math.min(FLIGHTS, i + BATCH); j += perStatement) {
        const end = Math.min(FLIGHTS, i + BATCH, j + perStatement);
        const bindings: (string | number | null)[] = [];
        for (let n = j; n < end; n++) bindings.push(...flightRow(n, ws, templates));
        await trx.raw(
          `INSERT INTO flights (${COLUMNS.join(', ')}) VALUES ${Array.from({ length: end - j }, () => row).join(', ')}`,
          bindings,
        );
      }
    });
    if ((i / BATCH) % 4 === 3) process.stdout.write(`  ${Math.min(FLIGHTS, i + BATCH)} flights\n`);
  }
  await k.raw('ANALYZE');
  return performance.now() - t0;
}

/* PostgreSQL: Debian's server in a temporary directory, as tests/pg/run.ts starts it. */

async function startPostgres(bin: string): Promise<{ url: string; stop: () => void }> {
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-bench-pg-'));
  const pg = await startScratchPostgres(bin, work, [
    'full_page_writes=off',
    'shared_buffers=256MB',
    'work_mem=32MB',
    'max_wal_size=4GB',
  ]);
  execFileSync('psql', [pg.adminUrl, '-q', '-c', 'CREATE DATABASE tropopass_bench']);
  return {
    url: `postgres://postgres@127.0.0.1:${pg.port}/tropopass_bench`,
    stop: () => {
      pg.stop('stopping PostgreSQL');
      fs.rmSync(work, { recursive: true, force: true });
    },
  };
}

/* Timing through the running app. */

interface Timing {
  label: string;
  target: number | null;
  ms: number[];
  status: number;
  note?: string;
}

async function timed(label: string, target: number | null, run: () => Promise<Response>, runs = RUNS): Promise<Timing> {
  const warm = await run();
  await warm.arrayBuffer();
  const ms: number[] = [];
  let status = warm.status;
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    const r = await run();
    await r.arrayBuffer();
    ms.push(performance.now() - t);
    status = r.status;
  }
  return { label, target, ms: ms.sort((a, b) => a - b), status };
}

/** Peak resident memory (VmHWM) of the server process and each of its descendants, in MB. */
function peakRssMb(pid: number): { self: number; all: number } {
  const children = new Map<number, number[]>();
  for (const d of fs.readdirSync('/proc').filter((x) => /^\d+$/.test(x))) {
    try {
      const stat = fs.readFileSync(`/proc/${d}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(d)]);
    } catch {
      /* gone */
    }
  }
  const hwm = (p: number) => {
    try {
      const m = /VmHWM:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${p}/status`, 'utf8'));
      return m ? Number(m[1]) / 1024 : 0;
    } catch {
      return 0;
    }
  };
  const all: number[] = [];
  const walk = (p: number) => {
    all.push(p);
    for (const c of children.get(p) ?? []) walk(c);
  };
  walk(pid);
  const figures = all.map(hwm);
  return { self: Math.max(...figures), all: figures.reduce((a, b) => a + b, 0) };
}

async function measureApp(app: RunningApp, k: Knex, ws: Workspace): Promise<Timing[]> {
  const base = app.baseUrl;
  const cookie = await sessionCookie(k, 'consultant@tropopass.test', SECRET);
  const get = (p: string) => () => fetch(`${base}${p}`, { headers: { cookie } });
  const api = `/api/v1/workspaces/${SLUG}`;
  const year = `from=${YEAR.from}&to=${YEAR.to}`;
  const deepRow = (await k('flights')
    .where({ workspace_id: ws.id })
    .orderBy([
      { column: 'date', order: 'desc' },
      { column: 'id', order: 'desc' },
    ])
    .offset(Math.floor(FLIGHTS * 0.8))
    .first('date', 'id')) as { date: string; id: number } | undefined;
  const cursor = deepRow ? encodeURIComponent(`${deepRow.date}~${deepRow.id}`) : '';
  const out: Timing[] = [];
  out.push(
    await timed('fleet comparison, year, API (by month)', 1000, get(`${api}/fleets/compare?${year}&groupBy=month`)),
  );
  out.push(
    await timed('fleet comparison, year, API (by fleet)', 1000, get(`${api}/fleets/compare?${year}&groupBy=fleet`)),
  );
  out.push(
    await timed(
      'fleet comparison, year, API, route filter',
      1000,
      get(`${api}/fleets/compare?${year}&groupBy=fleet&route=EGLL`),
    ),
  );
  out.push(await timed('fleets page, year (by month)', 1000, get(`/w/${SLUG}/fleets?${year}&groupBy=month`)));
  out.push(await timed('fleets page, default period', 1000, get(`/w/${SLUG}/fleets`)));
  out.push(await timed('overview page', 1000, get(`/w/${SLUG}`)));
  out.push(await timed('workspaces portfolio page', 1000, get('/workspaces')));
  out.push(await timed('flights page, first page', 200, get(`/w/${SLUG}/flights`)));
  out.push(await timed('flights page, deep page (80 %)', 200, get(`/w/${SLUG}/flights?cursor=${cursor}`)));
  out.push(await timed('flights API, first page', 200, get(`${api}/flights?limit=50`)));
  out.push(await timed('flights API, deep page (80 %)', 200, get(`${api}/flights?limit=50&cursor=${cursor}`)));

  const fleets = ws.fleets;
  let reportId = 0;
  const report = await timed(
    'fleet report for the year, build (POST)',
    15_000,
    async () => {
      const r = await fetch(`${base}${api}/reports`, {
        method: 'POST',
        headers: { cookie, origin: base, 'content-type': 'application/json' },
        body: JSON.stringify({ name: 'Bench year', from: YEAR.from, to: YEAR.to, fleetIds: fleets }),
      });
      const clone = r.clone();
      if (r.status === 201) reportId = ((await clone.json()) as { id: number }).id;
      return r;
    },
    Math.min(RUNS, 3),
  );
  out.push(report);
  out.push(await timed('fleet report PDF download', 15_000, get(`${api}/reports/${reportId}/pdf`)));
  out.push(await timed('fleet report CSV download', 15_000, get(`${api}/reports/${reportId}/csv`)));
  out.push({
    label: 'fleet-percentile run',
    target: null,
    ms: [],
    status: 0,
    note: 'skipped: no fleet-percentile run on this branch (the uncertainty work adds it)',
  });
  return out;
}

function printTable(name: string, rows: Timing[], rss: { self: number; all: number }, setup: string[]): void {
  const pad = (s: string, n: number) => s.padEnd(n);
  const right = (s: string, n: number) => s.padStart(n);
  console.log(`\n${name}: ${FLIGHTS.toLocaleString('en-GB')} screened flights, ${MONTHS[0]} to ${MONTHS[11]}`);
  for (const s of setup) console.log(`  ${s}`);
  console.log(
    `${pad('measure', 44)}${right('median ms', 11)}${right('max ms', 10)}${right('target ms', 11)}  under target  status`,
  );
  for (const r of rows) {
    if (!r.ms.length) {
      console.log(`${pad(r.label, 44)}${right('-', 11)}${right('-', 10)}${right('-', 11)}  ${r.note ?? ''}`);
      continue;
    }
    const median = r.ms[Math.floor(r.ms.length / 2)];
    const max = r.ms[r.ms.length - 1];
    console.log(
      `${pad(r.label, 44)}${right(median.toFixed(0), 11)}${right(max.toFixed(0), 10)}${right(r.target === null ? '-' : String(r.target), 11)}  ${pad(r.target === null ? '-' : median < r.target ? 'yes' : 'no', 12)}  ${r.status}`,
    );
  }
  console.log(
    `${pad('server peak RSS (VmHWM), MB', 44)}${right(rss.self.toFixed(0), 11)}${right(rss.all.toFixed(0), 10)}${right('800', 11)}  ${rss.self < 800 ? 'yes' : 'no'}            (median column: the largest process; max column: the server and its children together)`,
  );
}

async function runOne(kind: 'sqlite' | 'pg', templates: Template[], pgBin: string | null): Promise<void> {
  const dir = tempDir('tropopass-scale-');
  const port = await freePort();
  const pg = kind === 'pg' && pgBin ? await startPostgres(pgBin) : null;
  const env = benchNextEnv(
    appEnv({
      dir,
      port,
      extra: {
        NEXTAUTH_SECRET: SECRET,
        DEMO_TODAY: TODAY,
        IMPORT_WORKER: '0',
        BILLING_SENDER: '0',
        ...(pg ? { DATABASE_URL: pg.url } : {}),
      },
    }),
  );
  let app: RunningApp | null = null;
  let k: Knex | null = null;
  try {
    const t0 = performance.now();
    prepareDatabase(env);
    const migrateMs = performance.now() - t0;
    k = pg
      ? knexFactory({ client: 'pg', connection: pg.url, pool: { min: 0, max: 2 } })
      : knexFactory({
          client: 'better-sqlite3',
          connection: { filename: String(env.SQLITE_FILE) },
          useNullAsDefault: true,
        });
    const ws = await prepareWorkspace(k);
    let insertMs: number;
    if (pg) insertMs = await seedPostgres(k, ws, templates);
    else {
      await k.destroy();
      insertMs = seedSqlite(String(env.SQLITE_FILE), ws, templates);
      k = knexFactory({
        client: 'better-sqlite3',
        connection: { filename: String(env.SQLITE_FILE) },
        useNullAsDefault: true,
      });
    }
    const rollupMs = await finishWorkspace(k, ws);
    const rollups = (await k('flight_month_rollups').where({ workspace_id: ws.id }).count({ n: '*' }).first()) as {
      n: number | string;
    };
    const size = pg
      ? Number(
          ((await k.raw('select pg_database_size(current_database()) as b')) as { rows: { b: string }[] }).rows[0].b,
        )
      : fs.statSync(String(env.SQLITE_FILE)).size;
    const setup = [
      `migrate + demo seed ${(migrateMs / 1000).toFixed(1)} s; insert ${(insertMs / 1000).toFixed(1)} s (${Math.round(FLIGHTS / (insertMs / 1000)).toLocaleString('en-GB')} flights/s); roll-up rebuild ${(rollupMs / 1000).toFixed(1)} s (${Number(rollups.n)} roll-up rows); database ${(size / 2 ** 20).toFixed(0)} MB`,
    ];
    app = await startApp(env, port);
    const rows = await measureApp(app, k, ws);
    const rss = peakRssMb(app.child.pid ?? 0);
    printTable(kind === 'pg' ? 'PostgreSQL' : 'SQLite', rows, rss, setup);
    const errors = (app.output().match(/"level":50|Error:/g) ?? []).length;
    if (errors) console.log(`  server logged ${errors} error lines; last output:\n${app.output().slice(-1500)}`);
  } finally {
    if (app) await app.stop();
    if (k) await k.destroy();
    pg?.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

async function main(): Promise<number> {
  const { templates, ms } = screenTemplates();
  console.log(
    `bench:scale: ${templates.length} templates screened in ${ms.toFixed(0)} ms; ${FLIGHTS.toLocaleString('en-GB')} flights; ${os.cpus().length} cores, load average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')}`,
  );
  if (process.env.BENCH_BUILD === '1' || !hasBuild(BENCH_DIST_DIR)) build(benchNextEnv(process.env));
  const pgBin = pgBinDir();
  if (WHICH !== 'pg') await runOne('sqlite', templates, null);
  if (WHICH !== 'sqlite') {
    if (pgBin) await runOne('pg', templates, pgBin);
    else console.log('\nPostgreSQL: skipped (no /usr/lib/postgresql/*/bin/initdb; apt-get install -y postgresql)');
  }
  console.log(
    `\nload average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')} after (other work on the machine skews every figure); figures only, nothing here passes or fails`,
  );
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`bench:scale failed: ${err.stack ?? err.message}`);
    process.exit(1);
  },
);
