import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { idParam, MAX_ID } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import * as screeningRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/route';

useTestDatabase();

const notFound = (v: string) => {
  try {
    idParam(v);
    return false;
  } catch (err) {
    return err instanceof AppError && err.status === 404;
  }
};

describe('path ids', () => {
  it.each(['1', '42', String(MAX_ID)])('%s is an id', (v) => expect(idParam(v)).toBe(Number(v)));

  // PostgreSQL's integer (every id column) ends at 2^31 - 1; larger ids would be a database error there.
  it.each([String(MAX_ID + 1), '999999999999', '-1', '1.5', '1e3', '0x10', ' 1', '１', ''])(
    '%j is simply not found',
    (v) => expect(notFound(v)).toBe(true),
  );

  it('a route answers 404 for an id past the integer range', async () => {
    const ws = await makeWorkspace();
    const r = await call(
      screeningRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings/2147483648`, {
        cookie: await sessionCookie(ws.owner.id),
      }),
      { slug: ws.slug, id: '2147483648' },
    );
    expect(r.status).toBe(404);
  });
});
