import 'server-only';
import path from 'node:path';
import Database from 'better-sqlite3';
import {
  RateLimiterMemory,
  RateLimiterPostgres,
  RateLimiterRes,
  RateLimiterSQLite,
  type RateLimiterAbstract,
} from 'rate-limiter-flexible';
import { env } from '@/lib/env';
import { isPostgres } from '@/db/config';
import { db } from '@/db/client';
import { throttled } from '@/lib/errors';
import { UNKNOWN_CLIENT } from './client-ip';

const g = globalThis as unknown as { tropopassLimiters?: Limiters; tropopassLimitersFor?: unknown };

/**
 * What the limiters were built on: the Knex instance on PostgreSQL (their store), the database file on
 * SQLite. When that changes (the connection closed and reopened, another file), they are built again
 * instead of counting through a closed pool.
 */
function storeIdentity(): unknown {
  return isPostgres() ? db() : env().SQLITE_FILE;
}

export interface Limiters {
  /** Settles once the persistent limiters' tables exist. */
  ready: Promise<void>;
  signInAccount: RateLimiterAbstract;
  signInAddress: RateLimiterAbstract;
  email: RateLimiterAbstract;
  reportSends: RateLimiterAbstract;
  preview: RateLimiterAbstract;
  api: RateLimiterAbstract;
}

const WINDOW_S = 15 * 60;

interface LimiterSpec {
  /** Key prefix. */
  name: string;
  points: number;
  durationS: number;
  blockDurationS?: number;
}

/**
 * On PostgreSQL every limiter counts in the database, so all app instances share one count, with a
 * per-process block once a key is used up (no query per refused request) and an in-memory stand-in
 * while the database cannot be reached. All limiters share one table (made by a migration; keys carry
 * the limiter's prefix): the library names its prepared statements the same for
 * every table, and node-postgres refuses one name with two texts on a pooled connection, which with
 * a table each sent some counts to the in-memory stand-in.
 */
export const SHARED_THROTTLE_TABLE = 'throttle_counts';

function shared(spec: LimiterSpec, pending: Promise<void>[]): RateLimiterAbstract {
  const opts = {
    keyPrefix: spec.name,
    points: spec.points,
    duration: spec.durationS,
    blockDuration: spec.blockDurationS ?? 0,
  };
  let done: (err?: Error) => void = () => undefined;
  pending.push(new Promise<void>((resolve, reject) => (done = (err) => (err ? reject(err) : resolve()))));
  return new RateLimiterPostgres(
    {
      ...opts,
      storeClient: db(),
      storeType: 'knex',
      tableName: SHARED_THROTTLE_TABLE,
      // The table comes from a migration: the library creating it from several limiters at once races.
      tableCreated: true,
      inMemoryBlockOnConsumed: spec.points + 1,
      insuranceLimiter: new RateLimiterMemory(opts),
    },
    (err?: Error) => done(err),
  );
}

/**
 * On SQLite (one process) sign-in counters live in the database file so a restart does not reset
 * them; the limiter keeps its own table through its own connection. The other throttles count in
 * process memory.
 */
function sqliteFile(spec: LimiterSpec): RateLimiterAbstract {
  const file = path.resolve(/*turbopackIgnore: true*/ process.cwd(), env().SQLITE_FILE);
  const conn = new Database(file);
  conn.pragma('journal_mode = WAL');
  conn.pragma('busy_timeout = 5000');
  return new RateLimiterSQLite({
    keyPrefix: spec.name,
    points: spec.points,
    duration: spec.durationS,
    blockDuration: spec.blockDurationS ?? 0,
    storeClient: conn,
    storeType: 'better-sqlite3',
    tableName: 'throttle_signin',
  });
}

/**
 * A fresh set of limiters, as one process holds them. The app keeps one set per process
 * (`limiters()`); tests make two to stand for two instances.
 */
export function createLimiters(): Limiters {
  const e = env();
  const pending: Promise<void>[] = [];
  const pg = isPostgres();
  const signIn = (spec: LimiterSpec) => (pg ? shared(spec, pending) : sqliteFile(spec));
  const other = (spec: LimiterSpec) =>
    pg
      ? shared(spec, pending)
      : new RateLimiterMemory({ keyPrefix: spec.name, points: spec.points, duration: spec.durationS });
  const limiters: Limiters = {
    ready: Promise.resolve(),
    signInAccount: signIn({
      name: 'acct',
      points: e.RATE_LIMIT_SIGNIN_PER_15MIN,
      durationS: WINDOW_S,
      blockDurationS: WINDOW_S,
    }),
    signInAddress: signIn({
      name: 'addr',
      points: e.RATE_LIMIT_SIGNIN_PER_15MIN * 5,
      durationS: WINDOW_S,
      blockDurationS: WINDOW_S,
    }),
    email: other({ name: 'mail', points: e.RATE_LIMIT_EMAIL_PER_HOUR, durationS: 3600 }),
    reportSends: other({ name: 'report-mail', points: e.RATE_LIMIT_REPORT_SENDS_PER_HOUR, durationS: 3600 }),
    preview: other({ name: 'preview', points: e.RATE_LIMIT_PREVIEW_PER_MIN, durationS: 60 }),
    api: other({ name: 'api', points: e.RATE_LIMIT_API_PER_MIN, durationS: 60 }),
  };
  limiters.ready = Promise.all(pending).then(() => undefined);
  return limiters;
}

function limiters(): Limiters {
  const store = storeIdentity();
  if (!g.tropopassLimiters || g.tropopassLimitersFor !== store) {
    const created = createLimiters();
    g.tropopassLimiters = created;
    g.tropopassLimitersFor = store;
    created.ready.catch(() => {
      // Try again on the next request rather than refusing every one until a restart.
      if (g.tropopassLimiters === created) g.tropopassLimiters = undefined;
    });
  }
  return g.tropopassLimiters;
}

async function consume(pick: (l: Limiters) => RateLimiterAbstract, key: string, message: string): Promise<void> {
  const l = limiters();
  await l.ready;
  try {
    await pick(l).consume(key);
  } catch (err) {
    if (err instanceof RateLimiterRes) throw throttled(err.msBeforeNext / 1000, message);
    throw err;
  }
}

export class SignInLockedError extends Error {
  constructor(readonly retryAfterS: number) {
    const minutes = Math.max(1, Math.ceil(retryAfterS / 60));
    super(
      `Too many failed sign-ins. Sign-in is paused for about ${minutes} minute${minutes === 1 ? '' : 's'}; you can also use an e-mailed sign-in link.`,
    );
    this.name = 'SignInLockedError';
  }
}

/** Refuses a sign-in attempt while the account or the address is soft-locked. */
export async function assertSignInAllowed(email: string, ip: string): Promise<void> {
  const l = limiters();
  await l.ready;
  // Without a trusted proxy every client shares one key; throttling it would let anyone lock everyone out.
  const [a, b] = await Promise.all([
    l.signInAccount.get(email),
    ip === UNKNOWN_CLIENT ? null : l.signInAddress.get(ip),
  ]);
  const blocked = [a, b].filter((r): r is RateLimiterRes => !!r && r.remainingPoints <= 0 && r.msBeforeNext > 0);
  if (blocked.length) throw new SignInLockedError(Math.max(...blocked.map((r) => r.msBeforeNext)) / 1000);
}

export async function recordSignInFailure(email: string, ip: string): Promise<void> {
  const l = limiters();
  await l.ready;
  await Promise.all([
    l.signInAccount.consume(email).catch(() => undefined),
    ip === UNKNOWN_CLIENT ? undefined : l.signInAddress.consume(ip).catch(() => undefined),
  ]);
}

export async function recordSignInSuccess(email: string): Promise<void> {
  const l = limiters();
  await l.ready;
  await l.signInAccount.delete(email);
}

export function limitEmailSend(kind: 'signin' | 'reset' | 'invite', to: string): Promise<void> {
  return consume((l) => l.email, `${kind}:${to}`, 'Too many e-mails were requested for this address. Try again later.');
}

/** Report e-mails per workspace per hour (each send, whatever its number of recipients). */
export function limitReportSend(workspaceId: number): Promise<void> {
  return consume(
    (l) => l.reportSends,
    `ws:${workspaceId}`,
    'This workspace has sent many report e-mails in the last hour. Try again later.',
  );
}

export function limitPreview(key: string): Promise<void> {
  return consume((l) => l.preview, key, 'Previews are coming too fast. Wait a moment and try again.');
}

export function limitApi(key: string): Promise<void> {
  return consume((l) => l.api, key, 'Too many requests. Slow down and try again shortly.');
}
