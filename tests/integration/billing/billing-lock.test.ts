import { describe, expect, it } from 'vitest';
import { onPostgres, useTestDatabase } from '../../support/test-db';
import { db } from '@/db/client';
import { BILLING_LOCK_KEY, withBillingLock } from '@/lib/billing/runner';

useTestDatabase();

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe.runIf(onPostgres())('the usage sender runs once across processes (PostgreSQL advisory lock)', () => {
  it('skips its turn while another session holds the lock, and runs once it is released', async () => {
    let release: () => void = () => undefined;
    const released = new Promise<void>((r) => (release = r));
    let held: () => void = () => undefined;
    const isHeld = new Promise<void>((r) => (held = r));
    // Another process's tick: a different database session holding the same lock.
    const other = db().transaction(async (trx) => {
      await trx.raw('select pg_advisory_xact_lock(?)', [BILLING_LOCK_KEY]);
      held();
      await released;
    });
    await isHeld;
    let calls = 0;
    expect(await withBillingLock(async () => ++calls)).toEqual({ ran: false });
    expect(calls).toBe(0);
    release();
    await other;
    expect(await withBillingLock(async () => ++calls)).toEqual({ ran: true, value: 1 });
  });

  it('of several ticks started together, one runs and the others skip', async () => {
    let running = 0;
    let most = 0;
    const results = await Promise.all(
      Array.from({ length: 4 }, () =>
        withBillingLock(async () => {
          running += 1;
          most = Math.max(most, running);
          await pause(300);
          running -= 1;
          return true;
        }),
      ),
    );
    expect(results.filter((r) => r.ran)).toHaveLength(1);
    expect(most).toBe(1);
  });
});

describe.skipIf(onPostgres())('on SQLite (one process)', () => {
  it('the tick always runs', async () => {
    expect(await withBillingLock(async () => 'sent')).toEqual({ ran: true, value: 'sent' });
  });
});
