/**
 * `npm run test:scale`: the product as several processes on one PostgreSQL. Starts Debian's
 * PostgreSQL in a temporary directory (as `npm run test:pg` does), migrates and seeds it, starts the
 * payment fake, two web instances (`next start`, IMPORT_WORKER=0 BILLING_SENDER=0) and two worker
 * processes (`npm run worker`) on free ports, then checks:
 * - an API key created through instance A works on instance B;
 * - sign-in throttling counts failed attempts made on A and B together;
 * - a 20 000-row import uploaded through A is screened through the job queue (pg-boss), in steps, by
 *   worker 1, which is SIGKILLed mid-way with worker 2 running beside it: worker 2 takes the import
 *   over (worker 1's running step expires and is retried; the import's advisory lock went with worker
 *   1's connection), worker 1 is restarted, and every flight ends screened with one usage unit each;
 * - a job that always fails (an import whose flights the database refuses to update, by a trigger)
 *   is retried with back-off and ends as a dead letter: the import failed and unbilled, the job in
 *   the owner's list of failed jobs (GET .../jobs/failed) with its reason, refused to an analyst key;
 * - the usage senders (one per worker, under the advisory lock) send each unit once: the payment
 *   fake's meter events are the ledger's batches, each once, and their units equal the units sent.
 * Builds first when there is no build (under the checkout's e2e lock). SCALE_ROWS sets the import size.
 */
import { spawn, execFileSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knexFactory, { type Knex } from 'knex';
import Database from 'better-sqlite3';
import {
  appEnv,
  build,
  hasBuild,
  prepareDatabase,
  reexecUnderLock,
  ROOT,
  startApp,
  tempDir,
  type RunningApp,
} from '../soak/app-process';
import { freePort } from '../support/free-port';
import { sessionCookie } from '../support/session-cookie';
import { pgBinDir, startScratchPostgres } from '../support/scratch-postgres';

const ROWS = Number(process.env.SCALE_ROWS ?? 20_000);
const SLUG = 'skarn-polar';
const SECRET = 'scale-secret-0123456789-abcdefghijkl';
const SIGNIN_LIMIT = 4;
const PAIRS = [
  ['EGLL', 'KJFK'],
  ['EFHK', 'RJTT'],
  ['ENGM', 'KSEA'],
  ['BIKF', 'CYYZ'],
  ['EKCH', 'PANC'],
];

const problems: string[] = [];
const check = (ok: boolean, what: string) => {
  console.log(`[scale] ${ok ? 'ok    ' : 'FAILED'} ${what}`);
  if (!ok) problems.push(what);
};
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

function schedule(rows: number): string {
  const lines = ['date,flight,origin,destination,aircraft,cruise_fl,fuel_kg'];
  for (let i = 0; i < rows; i++) {
    const [o, d] = PAIRS[i % PAIRS.length];
    lines.push(
      `2026-10-${String(1 + (i % 30)).padStart(2, '0')},SC${i},${o},${d},SK-LR1,${330 + (i % 5) * 10},${40_000 + (i % 11) * 1000}`,
    );
  }
  return lines.join('\n');
}

function startWorker(env: NodeJS.ProcessEnv, name: string): ChildProcess {
  const child = spawn(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'lib/worker/main.ts'], {
    cwd: ROOT,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  child.stderr?.on('data', (b: Buffer) => process.stderr.write(`[${name}] ${b.toString()}`));
  return child;
}

async function killGroup(child: ChildProcess, signal: NodeJS.Signals): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null || !child.pid) return;
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  try {
    process.kill(-child.pid, signal);
  } catch {
    return;
  }
  await Promise.race([exited, pause(10_000)]);
}

/** One credentials sign-in through next-auth's own endpoints on `base`; the error text, or null on success. */
async function signIn(base: string, email: string, password: string, ip: string): Promise<string | null> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const cookie = (csrf.headers.getSetCookie?.() ?? []).map((c) => c.split(';')[0]).join('; ');
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie, origin: base, 'x-forwarded-for': ip },
    body: new URLSearchParams({ email, password, csrfToken, json: 'true' }),
    redirect: 'manual',
  });
  const body = (await res.json().catch(() => ({}))) as { url?: string };
  const url = new URL(body.url ?? res.headers.get('location') ?? base, base);
  return url.searchParams.get('error');
}

async function main(): Promise<number> {
  const locked = reexecUnderLock('tests/scale/run.ts');
  if (locked !== null) return locked;
  if (process.env.SCALE_BUILD === '1' || !hasBuild()) build();
  const started = Date.now();
  const bin = pgBinDir();
  if (!bin) throw new Error('PostgreSQL is not installed (npm run test:pg installs it when run as root)');
  const work = tempDir('tropopass-scale-');
  const pg = await startScratchPostgres(bin, work, ['max_connections=200']);
  const { port: pgPort, adminUrl: admin } = pg;
  execFileSync('psql', [admin, '-q', '-c', 'CREATE DATABASE tropopass_scale']);
  const databaseUrl = `postgres://postgres@127.0.0.1:${pgPort}/tropopass_scale`;
  console.log(
    `[scale] PostgreSQL on 127.0.0.1:${pgPort}; ${ROWS} rows; ${os.cpus().length} cores, load average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')}`,
  );

  const [portA, portB, fakePort] = [await freePort(), await freePort(), await freePort()];
  const fakeFile = path.join(work, 'payment-fake.sqlite');
  const common = {
    DATABASE_URL: databaseUrl,
    NEXTAUTH_SECRET: SECRET,
    STRIPE_API_PORT: String(fakePort),
    RATE_LIMIT_SIGNIN_PER_15MIN: String(SIGNIN_LIMIT),
    LOG_LEVEL: 'warn',
  };
  const webEnv = (port: number) =>
    appEnv({ dir: work, port, extra: { ...common, NEXTAUTH_SECRET: SECRET, IMPORT_WORKER: '0', BILLING_SENDER: '0' } });
  const workerEnv = {
    ...appEnv({ dir: work, port: portA, extra: common }),
    IMPORT_WORKER: '1',
    BILLING_SENDER: '1',
    BILLING_SENDER_INTERVAL_MS: '200',
    SCREENING_THREADS: '1',
  };
  prepareDatabase(webEnv(portA));
  const k: Knex = knexFactory({ client: 'pg', connection: databaseUrl, pool: { min: 0, max: 4 } });

  const fake = spawn(process.execPath, ['--import', 'tsx', 'lib/fakes/payment/server.ts'], {
    cwd: ROOT,
    env: {
      ...process.env,
      PAYMENT_FAKE_PORT: String(fakePort),
      PAYMENT_FAKE_DB: fakeFile,
      PAYMENT_WEBHOOK_URL: `http://127.0.0.1:${portA}/api/webhooks/stripe`,
    },
    stdio: 'ignore',
    detached: true,
  });
  let a: RunningApp | null = null;
  let b: RunningApp | null = null;
  const workers: ChildProcess[] = [];
  try {
    [a, b] = await Promise.all([startApp(webEnv(portA), portA), startApp(webEnv(portB), portB)]);
    // Worker 1 starts alone so that it is the one screening the import when it is killed.
    workers.push(startWorker(workerEnv, 'worker-1'));

    // An API key created through A (by the workspace owner's session) works on B.
    const cookie = await sessionCookie(k, 'consultant@tropopass.test', SECRET);
    const created = await fetch(`${a.baseUrl}/api/v1/workspaces/${SLUG}/api-keys`, {
      method: 'POST',
      headers: { cookie, origin: a.baseUrl, 'content-type': 'application/json' },
      body: JSON.stringify({ name: 'scale', role: 'analyst' }),
    });
    const key = ((await created.json()) as { key?: string }).key ?? '';
    check(created.status === 201 && key !== '', `API key created on A (${created.status})`);
    const onB = await fetch(`${b.baseUrl}/api/v1/workspaces/${SLUG}/screenings?limit=1`, {
      headers: { authorization: `Bearer ${key}` },
    });
    check(onB.status === 200, `the key works on B (${onB.status})`);

    // Sign-in throttling counts attempts on both instances together.
    const email = 'planner@tropopass.test';
    const wrong: (string | null)[] = [];
    for (let i = 0; i < SIGNIN_LIMIT; i++)
      wrong.push(await signIn((i % 2 === 0 ? a : b).baseUrl, email, 'not the password', `10.9.0.${i + 1}`));
    check(
      wrong.every((e) => e !== null && !/Too many/.test(e)),
      `${SIGNIN_LIMIT} wrong passwords, alternately on A and B, refused as wrong (${wrong.join(' | ')})`,
    );
    const lockedA = await signIn(a.baseUrl, email, 'tropopass-demo', '10.9.1.1');
    const lockedB = await signIn(b.baseUrl, email, 'tropopass-demo', '10.9.1.2');
    check(
      /Too many failed sign-ins/.test(lockedA ?? '') && /Too many failed sign-ins/.test(lockedB ?? ''),
      `then the right password is paused on both (${lockedA} | ${lockedB})`,
    );
    const other = await signIn(b.baseUrl, 'analyst@tropopass.test', 'tropopass-demo', '10.9.1.3');
    check(other === null, `another account still signs in (${other})`);

    // A 20 000-row import through A, screened by the workers; one of them is killed mid-way.
    const form = new FormData();
    form.set('file', new Blob([schedule(ROWS)], { type: 'text/csv' }), 'scale.csv');
    const up = await fetch(`${a.baseUrl}/api/v1/workspaces/${SLUG}/imports`, {
      method: 'POST',
      headers: { authorization: `Bearer ${key}` },
      body: form,
    });
    const importId = ((await up.json()) as { id?: number }).id ?? 0;
    check(up.status === 202 && importId > 0, `import of ${ROWS} rows accepted by A (${up.status})`);
    const progress = async () =>
      (await k('imports').where({ id: importId }).first()) as { status: string; rows_done: number };
    const deadline = Date.now() + 6 * 60_000;
    let p = await progress();
    while (Number(p.rows_done) < ROWS / 4 && p.status !== 'complete' && Date.now() < deadline) {
      await pause(100);
      p = await progress();
    }
    workers.push(startWorker(workerEnv, 'worker-2'));
    await pause(1500);
    p = await progress();
    const killedAt = Number(p.rows_done);
    await killGroup(workers[0], 'SIGKILL');
    check(
      killedAt > 0 && killedAt < ROWS,
      `worker 1 SIGKILLed mid-way, with worker 2 running beside it (${killedAt} / ${ROWS} rows screened)`,
    );
    // Worker 1's running step expires (30 s) and is retried by worker 2; the import's lock went with
    // worker 1's connection, so worker 2 may screen it at once.
    const takeover = Date.now() + 90_000;
    let after = Number(p.rows_done);
    while (after <= killedAt + 500 && Date.now() < takeover) {
      await pause(100);
      after = Number((await progress()).rows_done);
    }
    check(
      after > killedAt + 500,
      `worker 2 went on with the import (${killedAt} -> ${after} rows within ${((Date.now() - takeover + 90_000) / 1000).toFixed(1)} s)`,
    );
    workers[0] = startWorker(workerEnv, 'worker-1b');
    while (p.status !== 'complete' && p.status !== 'failed' && Date.now() < deadline) {
      await pause(250);
      p = await progress();
    }
    check(p.status === 'complete' && Number(p.rows_done) === ROWS, `import ${p.status}, ${p.rows_done} rows done`);
    const flights = (await k('flights')
      .where({ import_id: importId })
      .groupBy('status')
      .select('status')
      .count({ n: '*' })) as { status: string; n: string }[];
    const screened = Number(flights.find((f) => f.status === 'screened')?.n ?? 0);
    check(
      screened === ROWS && flights.length === 1,
      `every flight screened (${flights.map((f) => `${f.status} ${f.n}`).join(', ')})`,
    );
    const units = (await k('usage_events as u')
      .join('flights as f', 'f.id', 'u.source_id')
      .where({ 'u.kind': 'imported_flight', 'f.import_id': importId })
      .count({ n: '*' })
      .countDistinct({ d: 'u.source_id' })
      .first()) as { n: string; d: string };
    check(
      Number(units.n) === ROWS && Number(units.d) === ROWS,
      `one usage unit per flight (${units.n} units, ${units.d} flights)`,
    );

    // A job that always fails: the database refuses the writes of one import's flights.
    await k.raw(`CREATE FUNCTION scale_refuse() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF EXISTS (SELECT 1 FROM imports WHERE id = NEW.import_id AND file_name = 'always-fails.csv') THEN
          RAISE EXCEPTION 'writes refused for the scale test';
        END IF;
        RETURN NEW;
      END $$`);
    await k.raw('CREATE TRIGGER scale_refuse BEFORE UPDATE ON flights FOR EACH ROW EXECUTE FUNCTION scale_refuse()');
    const failing = new FormData();
    failing.set('file', new Blob([schedule(40).replace(/,SC/g, ',DL')], { type: 'text/csv' }), 'always-fails.csv');
    const upFailing = await fetch(`${a.baseUrl}/api/v1/workspaces/${SLUG}/imports`, {
      method: 'POST',
      headers: { authorization: `Bearer ${key}` },
      body: failing,
    });
    const failingId = ((await upFailing.json()) as { id?: number }).id ?? 0;
    check(
      upFailing.status === 202 && failingId > 0,
      `an import whose writes always fail accepted (${upFailing.status})`,
    );
    type FailedJob = { label: string; reason: string; attempts: number; failedAt: string };
    let listed: FailedJob | undefined;
    let listStatus = 0;
    const dlDeadline = Date.now() + 150_000;
    while (!listed && Date.now() < dlDeadline) {
      await pause(1000);
      const r = await fetch(`${b.baseUrl}/api/v1/workspaces/${SLUG}/jobs/failed`, {
        headers: { cookie },
      });
      listStatus = r.status;
      const items = r.ok ? ((await r.json()) as { items: FailedJob[] }).items : [];
      listed = items.find((j) => j.label === `Screening of import #${failingId}`);
    }
    check(
      listed !== undefined && listed.attempts === 5 && /database refused/.test(listed.reason),
      `its job is a dead letter in the owner's list after 5 attempts (${listStatus}: ${JSON.stringify(listed)})`,
    );
    const failedImport = await k('imports').where({ id: failingId }).first();
    const failingUnits = Number(
      (
        (await k('usage_events as u')
          .join('flights as f', 'f.id', 'u.source_id')
          .where({ 'u.kind': 'imported_flight', 'f.import_id': failingId })
          .count({ n: '*' })
          .first()) as { n: string }
      ).n,
    );
    check(
      (failedImport as { status: string }).status === 'failed' && failingUnits === 0,
      `that import ended failed with nothing billed (${(failedImport as { status: string }).status}, ${failingUnits} units)`,
    );
    const deadQueued = Number(
      (
        (await k.raw(`select count(*)::int as n from pgboss.job where name = 'import.screen__dead'`)) as {
          rows: { n: number }[];
        }
      ).rows[0].n,
    );
    check(deadQueued >= 1, `pg-boss holds it in the dead-letter queue (${deadQueued})`);
    const asAnalyst = await fetch(`${a.baseUrl}/api/v1/workspaces/${SLUG}/jobs/failed`, {
      headers: { authorization: `Bearer ${key}` },
    });
    check(asAnalyst.status === 403, `the failed-jobs list is refused to an analyst's key (${asAnalyst.status})`);
    await k.raw('DROP TRIGGER scale_refuse ON flights');

    // The senders drain the ledger; the payment service holds each batch once.
    const billable = () =>
      k('usage_events as u')
        .join('workspace_billing as b', 'b.workspace_id', 'u.workspace_id')
        .whereNotNull('b.subscription_id')
        .whereNotNull('b.metered_since')
        .whereRaw('u.occurred_at >= b.metered_since');
    let unsent = Infinity;
    while (Date.now() < deadline) {
      unsent = Number(((await billable().whereNull('u.sent_at').count({ n: '*' }).first()) as { n: string }).n);
      if (unsent === 0) break;
      await pause(250);
    }
    check(unsent === 0, `every billable unit sent (${unsent} left)`);
    const sentUnits = Number(
      ((await k('usage_events').whereNotNull('sent_at').count({ n: '*' }).first()) as { n: string }).n,
    );
    const batches = (await k('usage_batches').select('identifier', 'quantity', 'sent_at')) as {
      identifier: string;
      quantity: number;
      sent_at: string | null;
    }[];
    const fakeDb = new Database(fakeFile, { readonly: true });
    const events = fakeDb.prepare('select identifier, value from meter_events').all() as {
      identifier: string;
      value: number;
    }[];
    fakeDb.close();
    const byId = new Map(batches.map((x) => [x.identifier, x]));
    check(
      new Set(events.map((e) => e.identifier)).size === events.length,
      `no meter event twice (${events.length} events)`,
    );
    check(
      events.every((e) => byId.get(e.identifier)?.quantity === e.value),
      'every meter event is one usage batch with its count',
    );
    check(
      batches.filter((x) => x.sent_at).every((x) => events.some((e) => e.identifier === x.identifier)),
      'every batch marked sent is at the payment service',
    );
    check(sentUnits >= ROWS, `the import's units were billable and sent (${sentUnits} units sent in all)`);
    const providerUnits = events.reduce((s, e) => s + e.value, 0);
    check(
      providerUnits === sentUnits,
      `the payment service counts ${providerUnits} units, the ledger ${sentUnits} sent`,
    );
  } finally {
    for (const w of workers) await killGroup(w, 'SIGTERM');
    await Promise.all([a?.stop(), b?.stop()]);
    await killGroup(fake, 'SIGTERM');
    await k.destroy();
    pg.stop('[scale] stopping PostgreSQL');
    fs.rmSync(work, { recursive: true, force: true });
  }
  console.log(
    `[scale] ${problems.length ? `FAILED (${problems.length})` : 'passed'} in ${((Date.now() - started) / 1000).toFixed(0)} s`,
  );
  return problems.length ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`test:scale failed: ${err.stack ?? err.message}`);
    process.exit(1);
  },
);
