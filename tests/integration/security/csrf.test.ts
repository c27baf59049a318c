import { beforeAll, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, TEST_ORIGIN, useTestDatabase } from '../../support/test-db';
import { fillPattern, HTTP_METHODS, loadRoute, routeFiles, type HttpMethod, type RouteModule } from './discover';
import { ID_FIXTURES, resourceOf } from './fixtures';
import { createApiKey } from '@/lib/auth/api-keys';
import { rowCounts } from './tables';

useTestDatabase({ RATE_LIMIT_API_PER_MIN: '1000000', RATE_LIMIT_PREVIEW_PER_MIN: '1000000' });

const MUTATING: HttpMethod[] = ['POST', 'PUT', 'PATCH', 'DELETE'];
const FOREIGN = 'https://evil.example';

const targets: { file: string; pattern: string; params: string[]; method: HttpMethod; mod: RouteModule }[] = [];

beforeAll(async () => {
  for (const r of routeFiles()) {
    if (r.file.startsWith('app/api/auth/') || r.file.startsWith('app/api/webhooks/')) continue;
    const mod = await loadRoute(r);
    for (const m of HTTP_METHODS)
      if (MUTATING.includes(m) && typeof mod[m] === 'function') targets.push({ ...r, method: m, mod });
  }
});

describe('cross-site request forgery', () => {
  it('a cookie-authenticated mutation from a foreign Origin is refused with 403 and changes nothing', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const problems: string[] = [];
    for (const t of targets) {
      const values: Record<string, string> = { slug: ws.slug };
      for (const p of t.params.filter((x) => x !== 'slug')) {
        const make = ID_FIXTURES[resourceOf(t.pattern, p) ?? ''];
        values[p] = make ? String(await make(ws)) : '999999999';
      }
      const before = await rowCounts();
      const res = await call(
        t.mod[t.method],
        apiRequest(t.method, fillPattern(t.pattern, values), { cookie, origin: FOREIGN, body: {} }),
        values,
      );
      if (res.status !== 403 || res.body.error?.code !== 'forbidden')
        problems.push(`${t.file} ${t.method}: ${res.status}`);
      const after = await rowCounts();
      if (JSON.stringify(after) !== JSON.stringify(before)) problems.push(`${t.file} ${t.method}: rows changed`);
    }
    expect(targets.length).toBeGreaterThanOrEqual(4);
    expect(problems).toEqual([]);
  });

  it('the same mutation from the app origin, or with no Origin (non-browser client), is not refused as cross-site', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const t = targets.find((x) => x.pattern.endsWith('/workspaces/[slug]/screenings') && x.method === 'POST')!;
    for (const origin of [TEST_ORIGIN, undefined]) {
      const res = await call(
        t.mod.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, origin, body: {} }),
        { slug: ws.slug },
      );
      expect(res.status).toBe(422);
    }
    const lookalike = await call(
      t.mod.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
        cookie,
        origin: `${TEST_ORIGIN}.evil.example`,
        body: {},
      }),
      { slug: ws.slug },
    );
    expect(lookalike.status).toBe(403);
    const garbage = await call(
      t.mod.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, origin: 'null', body: {} }),
      { slug: ws.slug },
    );
    expect(garbage.status).toBe(403);
  });

  it('API-key requests are exempt: a foreign Origin with a bearer key is judged by the key alone', async () => {
    const ws = await makeWorkspace();
    const key = await createApiKey(
      { workspaceId: ws.id },
      { name: 'ci', role: 'analyst', createdBy: ws.owner.id, actor: 't' },
    );
    const t = targets.find((x) => x.pattern.endsWith('/workspaces/[slug]/screenings') && x.method === 'POST')!;
    const res = await call(
      t.mod.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { bearer: key.key, origin: FOREIGN, body: {} }),
      { slug: ws.slug },
    );
    expect(res.status).toBe(422);
  });
});
