/**
 * `npm run test:e2e`: builds the app, prepares a fresh demo database, starts the local fakes and the
 * built server on loopback, then runs the browser journeys (tests/e2e/*.e2e.ts) in Debian's Chromium.
 * Without Chromium the journeys are skipped with a loud notice, except under CI=true, where that fails.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { findChromium } from './support/chromium';
import { freePort } from '../support/free-port';

const root = process.cwd();
const isCi = process.env.CI === 'true';

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv, label: string): void {
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`${label} failed (exit ${r.status})`);
}

async function waitFor(url: string, child: ChildProcess, seconds = 60): Promise<void> {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`server exited early (code ${child.exitCode})`);
    try {
      const res = await fetch(url);
      if (res.status < 500) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`timed out waiting for ${url}`);
}

async function main(): Promise<number> {
  const chromium = findChromium();
  if (!chromium) {
    const line = '#'.repeat(78);
    console.error(
      `\n${line}\n# BROWSER JOURNEYS SKIPPED: no Chromium found (set CHROMIUM_PATH or apt-get install -y chromium).\n${line}\n`,
    );
    return isCi ? 1 : 0;
  }
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-e2e-'));
  const [appPort, smtpPort, mailHttpPort, payPort] = await Promise.all([
    freePort(),
    freePort(),
    freePort(),
    freePort(),
  ]);
  const baseUrl = `http://127.0.0.1:${appPort}`;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    SQLITE_FILE: path.join(work, 'e2e.sqlite'),
    DATABASE_URL: '',
    DEMO_TODAY: process.env.DEMO_TODAY ?? '2026-11-20',
    NEXTAUTH_URL: baseUrl,
    NEXTAUTH_SECRET: 'e2e-secret-0123456789-abcdefghijkl',
    MAIL_OUTBOX: '1',
    SMTP_PORT: String(smtpPort),
    MAIL_FAKE_HTTP_PORT: String(mailHttpPort),
    MAIL_FAKE_HTTP_URL: `http://127.0.0.1:${mailHttpPort}`,
    MAIL_FAKE_STORE: path.join(work, 'mail.jsonl'),
    PAYMENT_FAKE_PORT: String(payPort),
    PAYMENT_FAKE_DB: path.join(work, 'payment-fake.sqlite'),
    STRIPE_API_PORT: String(payPort),
    PAYMENT_WEBHOOK_URL: `${baseUrl}/api/webhooks/stripe`,
    STRIPE_WEBHOOK_SECRET: 'whsec_e2e_local_fake_secret',
    RATE_LIMIT_SIGNIN_PER_15MIN: '1000',
    RATE_LIMIT_PREVIEW_PER_MIN: '100000',
    RATE_LIMIT_API_PER_MIN: '100000',
    LOG_LEVEL: 'warn',
  };
  const knexCli = ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts'];
  if (process.env.E2E_SKIP_BUILD !== '1' || !fs.existsSync(path.join(root, '.next', 'BUILD_ID'))) {
    run(process.execPath, ['node_modules/next/dist/bin/next', 'build'], env, 'next build');
  }
  run(process.execPath, [...knexCli, 'migrate:latest'], env, 'migrate');
  run(process.execPath, [...knexCli, 'seed:run'], env, 'seed');

  const children: ChildProcess[] = [];
  // Each child leads its own process group, so stopping it also stops whatever it started.
  // The app's output is also kept in a file, so journeys can check that no secret reaches the server log.
  const serverLog = path.join(work, 'server.log');
  const start = (args: string[], label: string, logFile?: string) => {
    const c = spawn(args[0], args.slice(1), {
      cwd: root,
      env,
      stdio: ['ignore', logFile ? 'pipe' : 'inherit', logFile ? 'pipe' : 'inherit'],
      detached: true,
    });
    if (logFile) {
      const sink = fs.createWriteStream(logFile);
      c.stdout?.on('data', (d: Buffer) => {
        process.stdout.write(d);
        sink.write(d);
      });
      c.stderr?.on('data', (d: Buffer) => {
        process.stderr.write(d);
        sink.write(d);
      });
    }
    c.on('exit', (code) => {
      if (code && code !== 0 && !stopping) console.error(`[e2e] ${label} exited with ${code}`);
    });
    children.push(c);
    return c;
  };
  let stopping = false;
  try {
    start([process.execPath, '--import', 'tsx', 'lib/fakes/smtp/server.ts'], 'mail fake');
    start([process.execPath, '--import', 'tsx', 'lib/fakes/payment/server.ts'], 'payment fake');
    const app = start(
      [process.execPath, 'node_modules/next/dist/bin/next', 'start', '-H', '127.0.0.1', '-p', String(appPort)],
      'app',
      serverLog,
    );
    await waitFor(`${baseUrl}/signin`, app);
    await waitFor(`http://127.0.0.1:${mailHttpPort}/messages`, app);
    const r = spawnSync(
      process.execPath,
      ['node_modules/vitest/vitest.mjs', 'run', '--config', 'tests/e2e/vitest.config.ts', ...process.argv.slice(2)],
      {
        cwd: root,
        env: {
          ...env,
          E2E_BASE_URL: baseUrl,
          E2E_MAIL_URL: `http://127.0.0.1:${mailHttpPort}`,
          E2E_PAYMENT_URL: `http://127.0.0.1:${payPort}`,
          E2E_SERVER_LOG: serverLog,
          CHROMIUM_PATH: chromium,
          NODE_ENV: 'test',
        },
        stdio: 'inherit',
      },
    );
    return r.status ?? 1;
  } finally {
    stopping = true;
    const signal = (c: ChildProcess, sig: NodeJS.Signals) => {
      try {
        if (c.pid) process.kill(-c.pid, sig);
      } catch {
        /* already gone */
      }
    };
    for (const c of children) signal(c, 'SIGTERM');
    await new Promise((r) => setTimeout(r, 500));
    for (const c of children) if (c.exitCode === null) signal(c, 'SIGKILL');
    fs.rmSync(work, { recursive: true, force: true });
  }
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`[e2e] ${err.message}`);
    process.exit(1);
  },
);
