import { describe, expect, it } from 'vitest';
import { RateLimiterRes, type RateLimiterAbstract } from 'rate-limiter-flexible';
import { onPostgres, useTestDatabase } from '../../support/test-db';
import { db } from '@/db/client';
import { createLimiters, SHARED_THROTTLE_TABLE, type Limiters } from '@/lib/auth/throttle';

useTestDatabase({
  RATE_LIMIT_SIGNIN_PER_15MIN: '4',
  RATE_LIMIT_EMAIL_PER_HOUR: '3',
  RATE_LIMIT_REPORT_SENDS_PER_HOUR: '5',
  RATE_LIMIT_PREVIEW_PER_MIN: '6',
  RATE_LIMIT_API_PER_MIN: '8',
});

type Kind = Exclude<keyof Limiters, 'ready'>;
const LIMITS: [Kind, number][] = [
  ['signInAccount', 4],
  ['signInAddress', 20],
  ['email', 3],
  ['reportSends', 5],
  ['preview', 6],
  ['api', 8],
];

/** Consumes one point; true when allowed, false when the limiter refuses. */
async function take(limiter: RateLimiterAbstract, key: string): Promise<boolean> {
  try {
    await limiter.consume(key);
    return true;
  } catch (err) {
    if (err instanceof RateLimiterRes) return false;
    throw err;
  }
}

/** Two app instances' limiter sets, each as one process holds them. */
async function twoInstances(): Promise<[Limiters, Limiters]> {
  const a = createLimiters();
  const b = createLimiters();
  await Promise.all([a.ready, b.ready]);
  return [a, b];
}

describe.runIf(onPostgres())('throttles on PostgreSQL count across instances', () => {
  it.each(LIMITS)('%s: requests spread over two instances share one count of %i', async (kind, points) => {
    const [a, b] = await twoInstances();
    const key = `shared-${kind}-${Date.now()}`;
    const allowed: boolean[] = [];
    for (let i = 0; i < points; i++) allowed.push(await take((i % 2 === 0 ? a : b)[kind], key));
    expect(allowed.every(Boolean)).toBe(true);
    // Each instance alone has seen about half the limit, yet both now refuse.
    expect(await take(a[kind], key)).toBe(false);
    expect(await take(b[kind], key)).toBe(false);
    // Another key is counted apart.
    expect(await take(b[kind], `${key}-other`)).toBe(true);
    // The count is the database's, not an in-memory stand-in's (used only when a query fails).
    const stored = (await db()(SHARED_THROTTLE_TABLE).where('key', 'like', `%${key}`).select('points')) as {
      points: number;
    }[];
    expect(stored).toHaveLength(1);
    expect(Number(stored[0].points)).toBeGreaterThan(points);
  });

  it('a limiter set started later (a new instance) sees the count the others left', async () => {
    const [a] = await twoInstances();
    const key = `late-${Date.now()}`;
    for (let i = 0; i < 8; i++) expect(await take(a.api, key)).toBe(true);
    const c = createLimiters();
    await c.ready;
    expect(await take(c.api, key)).toBe(false);
  });
});

describe.skipIf(onPostgres())('throttles on SQLite (one process)', () => {
  it('sign-in counters are kept in the database file and so shared; the others count per process', async () => {
    const [a, b] = await twoInstances();
    const key = `sqlite-${Date.now()}`;
    for (let i = 0; i < 4; i++) expect(await take((i % 2 === 0 ? a : b).signInAccount, key)).toBe(true);
    expect(await take(b.signInAccount, key)).toBe(false);
    for (let i = 0; i < 8; i++) expect(await take(a.api, key)).toBe(true);
    expect(await take(a.api, key)).toBe(false);
    expect(await take(b.api, key)).toBe(true);
  });
});
