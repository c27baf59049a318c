/**
 * `npm run bench:load`: the built app under load, on 127.0.0.1 only. A fresh demo database, raised
 * rate limits and a workspace API key; then autocannon at 32 connections for 30 s each against a
 * trivial JSON route (this machine's reference), a single-flight preview, a save and a list. Prints
 * requests/s, p50/p99 latency, errors, non-2xx and the SQLITE_BUSY count seen in the server's output,
 * and the targets: preview >= half the reference's requests/s with p99 < 50 ms; save >= 150/s; no errors.
 *
 * Then the preview at 4 connections idle and again while a 100 000-row import screens (in the
 * server's worker threads), printing both p99s and their ratio (target: at most 2).
 *
 * Env: BENCH_SECONDS (default 30), BENCH_CONNECTIONS (default 32), BENCH_BUILD=1 to rebuild first,
 * BENCH_IMPORT_ROWS (default 100 000; 0 skips the import run), BENCH_IMPORT_SECONDS (default 10).
 * It builds into `.next-bench` (dist-dir.ts), never the `.next` a demo may be serving, and takes the
 * checkout's e2e lock for the whole run.
 */
import { createRequire } from 'node:module';
import fs from 'node:fs';
import os from 'node:os';
import Database from 'better-sqlite3';
import {
  appEnv,
  build,
  hasBuild,
  insertApiKey,
  prepareDatabase,
  reexecUnderLock,
  startApp,
  tempDir,
} from '../soak/app-process';
import { freePort } from '../support/free-port';
import { BENCH_DIST_DIR, benchNextEnv } from './dist-dir';

const require = createRequire(import.meta.url);

interface Histogram {
  average: number;
  p50: number;
  p99: number;
}
interface Result {
  requests: Histogram;
  latency: Histogram;
  errors: number;
  timeouts: number;
  non2xx: number;
  duration: number;
  statusCodeStats: Record<string, { count: number }>;
}
type Autocannon = (opts: Record<string, unknown>) => Promise<Result>;
const autocannon = require('autocannon') as Autocannon;

const SECONDS = Number(process.env.BENCH_SECONDS ?? 30);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 32);
const SLUG = 'skarn-polar';
const FEW = Number(process.env.BENCH_FEW_CONNECTIONS ?? 4);
const IMPORT_ROWS = Number(process.env.BENCH_IMPORT_ROWS ?? 100_000);
const IMPORT_SECONDS = Number(process.env.BENCH_IMPORT_SECONDS ?? 10);
const PAIRS = [
  ['EGLL', 'KJFK'],
  ['EFHK', 'RJTT'],
  ['ENGM', 'KSEA'],
  ['BIKF', 'CYYZ'],
  ['EKCH', 'PANC'],
];

/** `rows` distinct flights of the demo type SK-LR1, dated in October 2026. */
function schedule(rows: number): string {
  const lines = ['date,flight,origin,destination,aircraft,cruise_fl,fuel_kg'];
  for (let i = 0; i < rows; i++) {
    const [o, d] = PAIRS[i % PAIRS.length];
    lines.push(
      `2026-10-${String(1 + (i % 30)).padStart(2, '0')},LD${i},${o},${d},SK-LR1,${330 + (i % 5) * 10},${40_000 + (i % 11) * 1000}`,
    );
  }
  return lines.join('\n');
}

interface ImportRun {
  idle: Row;
  during: Row;
  rowsDoneBefore: number;
  rowsDoneAfter: number;
  rows: number;
  statusAfter: string;
}

/**
 * The preview at FEW connections idle, then during the screening of an IMPORT_ROWS-row import
 * (measured once the worker has started on it, for IMPORT_SECONDS each).
 */
async function previewDuringImport(base: string, auth: Record<string, string>): Promise<ImportRun> {
  const preview = {
    url: `${base}/api/v1/workspaces/${SLUG}/screenings/preview`,
    method: 'POST',
    headers: auth,
    body: JSON.stringify(FLIGHT),
    connections: FEW,
    duration: IMPORT_SECONDS,
  };
  const idle = await measure(`preview at ${FEW} connections, idle`, preview);
  const form = new FormData();
  form.set('file', new Blob([schedule(IMPORT_ROWS)], { type: 'text/csv' }), 'load.csv');
  const up = await fetch(`${base}/api/v1/workspaces/${SLUG}/imports`, {
    method: 'POST',
    headers: { authorization: auth.authorization },
    body: form,
  });
  const body = (await up.json()) as { id?: number };
  if (up.status !== 202 || typeof body.id !== 'number')
    throw new Error(`import upload: ${up.status} ${JSON.stringify(body).slice(0, 300)}`);
  const status = async () =>
    (await (await fetch(`${base}/api/v1/workspaces/${SLUG}/imports/${body.id}`, { headers: auth })).json()) as {
      status: string;
      rows: number;
      rowsDone: number;
    };
  const until = Date.now() + 120_000;
  let before = await status();
  while (before.rowsDone === 0 && before.status !== 'complete' && Date.now() < until) {
    await new Promise((r) => setTimeout(r, 100));
    before = await status();
  }
  const during = await measure(`preview at ${FEW} connections, importing`, preview);
  const after = await status();
  return {
    idle,
    during,
    rowsDoneBefore: before.rowsDone,
    rowsDoneAfter: after.rowsDone,
    rows: after.rows,
    statusAfter: after.status,
  };
}

const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 52_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
};

interface Row {
  name: string;
  rps: number;
  p50: number;
  p99: number;
  errors: number;
  non2xx: number;
  total: number;
  statuses: string;
}

async function measure(name: string, opts: Record<string, unknown>): Promise<Row> {
  const r = await autocannon({ connections: CONNECTIONS, duration: SECONDS, ...opts });
  const total = Object.values(r.statusCodeStats ?? {}).reduce((a, s) => a + Number(s.count), 0);
  return {
    name,
    rps: r.requests.average,
    p50: r.latency.p50,
    p99: r.latency.p99,
    errors: r.errors + r.timeouts,
    non2xx: r.non2xx,
    total,
    statuses: Object.entries(r.statusCodeStats ?? {})
      .map(([k, v]) => `${k}:${v.count}`)
      .join(' '),
  };
}

/** One client's previews with sampling and the month sweep, one after another (issue 12's interactive target). */
async function sequentialPreviews(
  url: string,
  headers: Record<string, string>,
  n = 200,
): Promise<{ p50: number; p95: number; n: number }> {
  const body = JSON.stringify({ ...FLIGHT, uncertainty: { samples: 400 }, months: true });
  for (let i = 0; i < 10; i++) await (await fetch(url, { method: 'POST', headers, body })).arrayBuffer();
  const ms: number[] = [];
  for (let i = 0; i < n; i++) {
    const t = performance.now();
    const r = await fetch(url, { method: 'POST', headers, body });
    await r.arrayBuffer();
    if (r.status !== 200) throw new Error(`preview with sampling answered ${r.status}`);
    ms.push(performance.now() - t);
  }
  ms.sort((a, b) => a - b);
  return { p50: ms[Math.floor(0.5 * n)], p95: ms[Math.floor(0.95 * n)], n };
}

async function main(): Promise<number> {
  const locked = reexecUnderLock('tests/bench/load.ts');
  if (locked !== null) return locked;
  if (process.env.BENCH_BUILD === '1' || !hasBuild(BENCH_DIST_DIR)) build(benchNextEnv(process.env));
  const dir = tempDir('tropopass-load-');
  const port = await freePort();
  const env = benchNextEnv(appEnv({ dir, port }));
  prepareDatabase(env);
  const file = String(env.SQLITE_FILE);
  const key = insertApiKey(file, SLUG, 'analyst');
  const app = await startApp(env, port);
  const auth = { authorization: `Bearer ${key}`, 'content-type': 'application/json' };
  const base = app.baseUrl;
  const rows: Row[] = [];
  let sampled = { p50: Number.NaN, p95: Number.NaN, n: 0 };
  let importRun: ImportRun | null = null;
  try {
    // Warm up each route (first requests load and compile the route's modules).
    for (let i = 0; i < 20; i++) {
      await fetch(`${base}/api/health`);
      await fetch(`${base}/api/v1/workspaces/${SLUG}/screenings/preview`, {
        method: 'POST',
        headers: auth,
        body: JSON.stringify(FLIGHT),
      });
      await fetch(`${base}/api/v1/workspaces/${SLUG}/screenings?limit=20`, { headers: auth });
    }
    console.log(
      `load: ${CONNECTIONS} connections, ${SECONDS} s per route, ${base}; ${os.cpus().length} cores, load average ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')} before`,
    );
    rows.push(await measure('reference GET /api/health', { url: `${base}/api/health` }));
    rows.push(
      await measure('preview POST .../screenings/preview', {
        url: `${base}/api/v1/workspaces/${SLUG}/screenings/preview`,
        method: 'POST',
        headers: auth,
        body: JSON.stringify(FLIGHT),
      }),
    );
    rows.push(
      await measure('save POST .../screenings', {
        url: `${base}/api/v1/workspaces/${SLUG}/screenings`,
        method: 'POST',
        headers: auth,
        body: JSON.stringify({ ...FLIGHT, name: 'load' }),
      }),
    );
    rows.push(
      await measure('list GET .../screenings?limit=20', {
        url: `${base}/api/v1/workspaces/${SLUG}/screenings?limit=20`,
        headers: auth,
      }),
    );
    // Latency depends on concurrency (Little's law: mean latency = connections / throughput), so the
    // preview is also measured at a planner-like concurrency.
    rows.push(
      await measure(`preview at ${FEW} connections`, {
        url: `${base}/api/v1/workspaces/${SLUG}/screenings/preview`,
        method: 'POST',
        headers: auth,
        body: JSON.stringify(FLIGHT),
        connections: FEW,
      }),
    );
    sampled = await sequentialPreviews(`${base}/api/v1/workspaces/${SLUG}/screenings/preview`, auth);
    if (IMPORT_ROWS > 0) importRun = await previewDuringImport(base, auth);
  } finally {
    await app.stop();
  }
  console.log(
    `load average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')} after (other work on the machine skews every figure)`,
  );
  const busy = (app.output().match(/SQLITE_BUSY/g) ?? []).length;
  const conn = new Database(file, { readonly: true });
  const saved = (conn.prepare("select count(*) as n from screenings where name = 'load'").get() as { n: number }).n;
  const units = (
    conn
      .prepare(
        "select count(*) as n from usage_events where kind = 'screening' and source_id in (select id from screenings where name = 'load')",
      )
      .get() as { n: number }
  ).n;
  const integrity = String(conn.pragma('integrity_check', { simple: true }));
  conn.close();

  const pad = (s: string, n: number) => s.padEnd(n);
  const num = (v: number, d = 0) => v.toFixed(d).padStart(9);
  console.log(
    `\n${pad('route', 38)}${'req/s'.padStart(9)}${'p50 ms'.padStart(9)}${'p99 ms'.padStart(9)}${'errors'.padStart(9)}${'non-2xx'.padStart(9)}  statuses`,
  );
  for (const r of [...rows, ...(importRun ? [importRun.idle, importRun.during] : [])])
    console.log(
      `${pad(r.name, 38)}${num(r.rps)}${num(r.p50, 1)}${num(r.p99, 1)}${num(r.errors)}${num(r.non2xx)}  ${r.statuses}`,
    );
  if (importRun) {
    const ratio = importRun.during.p99 / Math.max(importRun.idle.p99, 0.001);
    console.log(
      `preview p99 at ${FEW} connections: ${importRun.idle.p99.toFixed(1)} ms idle, ${importRun.during.p99.toFixed(1)} ms while a ${importRun.rows}-row import screened ` +
        `(rows ${importRun.rowsDoneBefore} -> ${importRun.rowsDoneAfter} during the measurement, import ${importRun.statusAfter} after it); ratio ${ratio.toFixed(2)}`,
    );
  }
  console.log(
    `SQLITE_BUSY in server output: ${busy}; saved screenings: ${saved}, their usage units: ${units}; integrity_check: ${integrity}`,
  );
  console.log(
    `preview with uncertainty { samples: 400 } and months: true, one client, ${sampled.n} requests one after another: p50 ${sampled.p50.toFixed(1)} ms, p95 ${sampled.p95.toFixed(1)} ms`,
  );

  const [ref, preview, save, , fewPreview] = rows;
  const checks: [string, boolean][] = [
    [
      `preview >= half the reference (${preview.rps.toFixed(0)} vs ${(ref.rps / 2).toFixed(0)} req/s)`,
      preview.rps >= ref.rps / 2,
    ],
    [
      `preview p99 < 50 ms at ${CONNECTIONS} connections (${preview.p99.toFixed(1)} ms; at least ${(CONNECTIONS / 0.05) | 0} req/s would be needed)`,
      preview.p99 < 50,
    ],
    [`preview p99 < 50 ms at ${FEW} connections (${fewPreview.p99.toFixed(1)} ms)`, fewPreview.p99 < 50],
    [`save >= 150 req/s (${save.rps.toFixed(0)})`, save.rps >= 150],
    [
      `preview with 400 samples and the month sweep p95 < 150 ms with one client (${sampled.p95.toFixed(1)} ms)`,
      sampled.p95 < 150,
    ],
    [
      `zero errors and non-2xx (${rows.reduce((a, r) => a + r.errors + r.non2xx, 0)})`,
      rows.every((r) => r.errors === 0 && r.non2xx === 0),
    ],
    [`one unit per saved screening (${saved} / ${units})`, saved === units],
    [`no SQLITE_BUSY (${busy})`, busy === 0],
  ];
  if (importRun) {
    const ratio = importRun.during.p99 / Math.max(importRun.idle.p99, 0.001);
    const screenedThroughout = importRun.rowsDoneAfter < importRun.rows || importRun.statusAfter !== 'complete';
    checks.push([
      `preview p99 at ${FEW} connections during the import within 2 x idle (ratio ${ratio.toFixed(2)})`,
      ratio <= 2,
    ]);
    checks.push([
      `the import was still screening when the measurement ended (${importRun.rowsDoneAfter} / ${importRun.rows} rows)`,
      screenedThroughout,
    ]);
    checks.push([
      `zero errors during the import run`,
      importRun.idle.errors + importRun.during.errors + importRun.idle.non2xx + importRun.during.non2xx === 0,
    ]);
  }
  console.log('\ntargets:');
  for (const [label, ok] of checks) console.log(`  ${ok ? 'met   ' : 'MISSED'} ${label}`);
  fs.rmSync(dir, { recursive: true, force: true });
  return process.env.BENCH_STRICT === '1' && checks.some(([, ok]) => !ok) ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`bench:load failed: ${err.stack ?? err.message}`);
    process.exit(1);
  },
);
