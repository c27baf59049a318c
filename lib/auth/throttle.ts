import 'server-only';
import path from 'node:path';
import Database from 'better-sqlite3';
import { RateLimiterMemory, RateLimiterPostgres, RateLimiterRes, RateLimiterSQLite, type RateLimiterAbstract } from 'rate-limiter-flexible';
import { env } from '@/lib/env';
import { isPostgres } from '@/db/config';
import { db } from '@/db/client';
import { throttled } from '@/lib/errors';
import { UNKNOWN_CLIENT } from './client-ip';

const g = globalThis as unknown as { tropopassLimiters?: Limiters };

interface Limiters {
  /** Settles once the persistent limiters' tables exist. */
  ready: Promise<void>;
  signInAccount: RateLimiterAbstract;
  signInAddress: RateLimiterAbstract;
  email: RateLimiterMemory;
  reportSends: RateLimiterMemory;
  preview: RateLimiterMemory;
  api: RateLimiterMemory;
}

const WINDOW_S = 15 * 60;

function persistent(keyPrefix: string, points: number, pending: Promise<void>[]): RateLimiterAbstract {
  const opts = { keyPrefix, points, duration: WINDOW_S, blockDuration: WINDOW_S };
  if (isPostgres()) {
    // Stored through the app's own pool; each limiter creates its own table on start (one table
    // each, so two concurrent CREATE TABLE IF NOT EXISTS cannot collide).
    let done: (err?: Error) => void = () => undefined;
    pending.push(new Promise<void>((resolve, reject) => (done = (err) => (err ? reject(err) : resolve()))));
    return new RateLimiterPostgres({ ...opts, storeClient: db(), storeType: 'knex', tableName: `throttle_signin_${keyPrefix}` }, (err?: Error) => done(err));
  }
  // Sign-in counters live in the database file so a restart does not reset them; the limiter
  // keeps its own table through its own connection.
  const file = path.resolve(/*turbopackIgnore: true*/ process.cwd(), env().SQLITE_FILE);
  const conn = new Database(file);
  conn.pragma('journal_mode = WAL');
  conn.pragma('busy_timeout = 5000');
  return new RateLimiterSQLite({ ...opts, storeClient: conn, storeType: 'better-sqlite3', tableName: 'throttle_signin' });
}

function limiters(): Limiters {
  if (!g.tropopassLimiters) {
    const e = env();
    const pending: Promise<void>[] = [];
    g.tropopassLimiters = {
      ready: Promise.resolve(),
      signInAccount: persistent('acct', e.RATE_LIMIT_SIGNIN_PER_15MIN, pending),
      signInAddress: persistent('addr', e.RATE_LIMIT_SIGNIN_PER_15MIN * 5, pending),
      email: new RateLimiterMemory({ keyPrefix: 'mail', points: e.RATE_LIMIT_EMAIL_PER_HOUR, duration: 3600 }),
      reportSends: new RateLimiterMemory({ keyPrefix: 'report-mail', points: e.RATE_LIMIT_REPORT_SENDS_PER_HOUR, duration: 3600 }),
      preview: new RateLimiterMemory({ keyPrefix: 'preview', points: e.RATE_LIMIT_PREVIEW_PER_MIN, duration: 60 }),
      api: new RateLimiterMemory({ keyPrefix: 'api', points: e.RATE_LIMIT_API_PER_MIN, duration: 60 }),
    };
    g.tropopassLimiters.ready = Promise.all(pending).then(
      () => undefined,
      (err: unknown) => {
        // Try again on the next sign-in rather than refusing every one until a restart.
        g.tropopassLimiters = undefined;
        throw err;
      },
    );
  }
  return g.tropopassLimiters;
}

async function consume(limiter: RateLimiterAbstract, key: string, message: string): Promise<void> {
  try {
    await limiter.consume(key);
  } catch (err) {
    if (err instanceof RateLimiterRes) throw throttled(err.msBeforeNext / 1000, message);
    throw err;
  }
}

export class SignInLockedError extends Error {
  constructor(readonly retryAfterS: number) {
    const minutes = Math.max(1, Math.ceil(retryAfterS / 60));
    super(`Too many failed sign-ins. Sign-in is paused for about ${minutes} minute${minutes === 1 ? '' : 's'}; you can also use an e-mailed sign-in link.`);
    this.name = 'SignInLockedError';
  }
}

/** Refuses a sign-in attempt while the account or the address is soft-locked. */
export async function assertSignInAllowed(email: string, ip: string): Promise<void> {
  const l = limiters();
  await l.ready;
  // Without a trusted proxy every client shares one key; throttling it would let anyone lock everyone out.
  const [a, b] = await Promise.all([l.signInAccount.get(email), ip === UNKNOWN_CLIENT ? null : l.signInAddress.get(ip)]);
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
  return consume(limiters().email, `${kind}:${to}`, 'Too many e-mails were requested for this address. Try again later.');
}

/** Report e-mails per workspace per hour (each send, whatever its number of recipients). */
export function limitReportSend(workspaceId: number): Promise<void> {
  return consume(limiters().reportSends, `ws:${workspaceId}`, 'This workspace has sent many report e-mails in the last hour. Try again later.');
}

export function limitPreview(key: string): Promise<void> {
  return consume(limiters().preview, key, 'Previews are coming too fast. Wait a moment and try again.');
}

export function limitApi(key: string): Promise<void> {
  return consume(limiters().api, key, 'Too many requests. Slow down and try again shortly.');
}
