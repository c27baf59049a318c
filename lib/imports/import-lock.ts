import 'server-only';
import { db, usingPostgres } from '@/db/client';

/**
 * On PostgreSQL several worker processes poll the same imports; each screens an import only while it
 * holds that import's session-level advisory lock, on a connection kept for the purpose. When a
 * worker dies its connection closes and the server releases the lock at once, so another worker takes
 * the import over on its next poll. On SQLite one process screens and the lock is a no-op.
 */

/** The first half of the two-key advisory lock: this namespace (any fixed 32-bit number). */
const IMPORT_LOCK_SPACE = 72_431_905;

export interface ImportLease {
  release(): Promise<void>;
}

interface PgConnection {
  query(sql: string, values: unknown[]): Promise<{ rows: { ok: boolean }[] }>;
}
interface PoolClient {
  acquireConnection(): Promise<PgConnection>;
  releaseConnection(conn: PgConnection): Promise<void>;
}

const NO_LOCK: ImportLease = { release: async () => undefined };

/** The import's lease, or null when another process is screening it. */
export async function leaseImport(importId: number): Promise<ImportLease | null> {
  if (!usingPostgres()) return NO_LOCK;
  const client = db().client as unknown as PoolClient;
  const conn = await client.acquireConnection();
  try {
    const r = await conn.query('select pg_try_advisory_lock($1, $2) as ok', [IMPORT_LOCK_SPACE, importId]);
    if (!r.rows[0]?.ok) {
      await client.releaseConnection(conn);
      return null;
    }
  } catch (err) {
    await client.releaseConnection(conn);
    throw err;
  }
  return {
    release: async () => {
      try {
        await conn.query('select pg_advisory_unlock($1, $2) as ok', [IMPORT_LOCK_SPACE, importId]);
      } finally {
        await client.releaseConnection(conn);
      }
    },
  };
}

/** For tests: the lock as another process would hold it. */
export const IMPORT_LOCK_KEYS = (importId: number): [number, number] => [IMPORT_LOCK_SPACE, importId];
