import { beforeAll, describe, expect, it } from 'vitest';
import { apiRequest, call, makeUser, makeWorkspace, sessionCookie } from '../../support/test-db';
import { useBillingHarness } from '../billing/harness';
import {
  HTTP_METHODS,
  fillPattern,
  loadRoute,
  routeFiles,
  type HttpMethod,
  type RouteFile,
  type RouteModule,
} from './discover';
import { BILLING_ID_FIXTURES, ID_FIXTURES, resourceOf, type Ws } from './fixtures';
import { API_KEY_ROLES, PERMISSIONS, ROLES, can, type Permission, type Role } from '@/lib/auth/policy';
import { createApiKey } from '@/lib/auth/api-keys';

// The billing harness gives the file its database and the local payment fake the invoice fixture needs.
/** Every role over every workspace route: hundreds of handler calls, minutes on a loaded 2-core machine with PostgreSQL. */
const MATRIX_TIMEOUT_MS = 180_000;

useBillingHarness({ RATE_LIMIT_API_PER_MIN: '1000000', RATE_LIMIT_PREVIEW_PER_MIN: '1000000' });

/**
 * Routes outside any workspace, each with the reason it needs no workspace permission. `auth`:
 * must refuse an anonymous caller with 401; `public`: answers anyone by design.
 */
const NON_WORKSPACE_ROUTES: Record<string, { access: 'auth' | 'public'; reason: string }> = {
  'app/api/auth/[...nextauth]/route.ts': { access: 'public', reason: 'next-auth sign-in, sign-out and CSRF endpoints' },
  'app/api/v1/workspaces/route.ts': {
    access: 'auth',
    reason: "the caller's own workspaces; creating one makes the caller its owner",
  },
  'app/api/v1/atmosphere/route.ts': { access: 'auth', reason: 'computation only (ISA), no workspace data' },
  'app/api/v1/tropopause/route.ts': {
    access: 'auth',
    reason: 'computation only (WMO tropopause of a posted sounding)',
  },
  'app/api/v1/airports/route.ts': { access: 'auth', reason: 'reference data (airport type-ahead)' },
  'app/api/v1/openapi.json/route.ts': { access: 'public', reason: 'the published API description' },
  'app/api/webhooks/stripe/route.ts': {
    access: 'public',
    reason: 'payment events, authenticated by their signature header',
  },
  'app/api/health/route.ts': { access: 'public', reason: 'liveness probe for the load benchmark, no data' },
};

const routes = routeFiles();
const workspaceRoutes = routes.filter((r) => r.inWorkspace);
const modules = new Map<string, RouteModule>();

beforeAll(async () => {
  for (const r of routes) modules.set(r.file, await loadRoute(r));
});

const methodsOf = (r: RouteFile): HttpMethod[] =>
  HTTP_METHODS.filter((m) => typeof modules.get(r.file)?.[m] === 'function');

describe('every route is accounted for (server actions: actions-matrix.test.ts)', () => {
  it('discovers the route files', () => {
    expect(routes.length).toBeGreaterThanOrEqual(10);
    expect(workspaceRoutes.length).toBeGreaterThanOrEqual(4);
  });

  it('each workspace route handler carries a permission from the policy table', () => {
    const problems: string[] = [];
    for (const r of workspaceRoutes) {
      const methods = methodsOf(r);
      if (!methods.length) problems.push(`${r.file}: exports no handler`);
      for (const m of methods) {
        const p = modules.get(r.file)?.[m]?.permission;
        if (!p) problems.push(`${r.file} ${m}: no permission (wrap it in workspaceRoute(permission, fn))`);
        else if (!(PERMISSIONS as readonly string[]).includes(p))
          problems.push(`${r.file} ${m}: unknown permission ${p}`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('each route outside a workspace is allow-listed with a reason', () => {
    const unlisted = routes.filter((r) => !r.inWorkspace && !NON_WORKSPACE_ROUTES[r.file]).map((r) => r.file);
    expect(unlisted, 'add the route to NON_WORKSPACE_ROUTES with its reason, or put it under a workspace').toEqual([]);
  });

  it("allow-listed 'auth' routes refuse an anonymous caller with 401", async () => {
    const problems: string[] = [];
    for (const r of routes.filter((x) => NON_WORKSPACE_ROUTES[x.file]?.access === 'auth')) {
      for (const m of methodsOf(r)) {
        const res = await call(
          modules.get(r.file)?.[m],
          apiRequest(m, fillPattern(r.pattern, {}), m === 'GET' || m === 'DELETE' ? {} : { body: {} }),
          {},
        );
        if (res.status !== 401) problems.push(`${r.file} ${m}: ${res.status}`);
      }
    }
    expect(problems).toEqual([]);
  });
});

interface Setup {
  own: Ws & { members: Record<Role, { id: number }> };
  other: Ws;
}

let setup: Setup;
beforeAll(async () => {
  const own = await makeWorkspace(['planner', 'analyst', 'viewer', 'billing']);
  const other = await makeWorkspace(['planner', 'analyst', 'viewer', 'billing']);
  setup = { own: { ...own, members: own.members as Record<Role, { id: number }> }, other };
});

/** Values for a route's params in a workspace: a real row where a fixture exists, else a missing id. */
async function paramsFor(r: RouteFile, ws: Ws): Promise<{ values: Record<string, string>; real: boolean }> {
  const values: Record<string, string> = { slug: ws.slug, workspace: ws.slug };
  let real = true;
  for (const p of r.params) {
    if (p === 'slug' || p === 'workspace') continue;
    const resource = resourceOf(r.pattern, p) ?? '';
    const make = ID_FIXTURES[resource] ?? BILLING_ID_FIXTURES[resource];
    if (make) values[p] = String(await make(ws));
    else {
      values[p] = '999999999';
      real = false;
    }
  }
  return { values, real };
}

function request(method: HttpMethod, url: string, auth: { cookie?: string; bearer?: string }): Request {
  return apiRequest(method, url, { ...auth, ...(method === 'GET' || method === 'DELETE' ? {} : { body: {} }) });
}

interface Outcome {
  route: string;
  method: HttpMethod;
  who: string;
  permission: Permission;
  status: number;
  expected: string;
}

function judge(o: Omit<Outcome, 'expected'>, allowed: boolean, other: boolean, real: boolean): Outcome | null {
  if (o.status >= 500) return { ...o, expected: 'never a 5xx' };
  if (other) return o.status === 404 ? null : { ...o, expected: '404 (not a member of that workspace)' };
  if (!allowed) return o.status === 403 ? null : { ...o, expected: '403 (role lacks the permission)' };
  if (o.status === 401 || o.status === 403) return { ...o, expected: 'allowed (not 401/403)' };
  if (o.status === 404 && real) return { ...o, expected: 'allowed (not 404: the row exists)' };
  return null;
}

describe('every role x every workspace route and method x own and other workspace', () => {
  it(
    'signed-in members: 404 elsewhere, 403 where the policy denies, allowed where it allows',
    async () => {
      const failures: Outcome[] = [];
      const ambiguous = new Set<string>();
      let calls = 0;
      for (const r of workspaceRoutes) {
        for (const method of methodsOf(r)) {
          const handler = modules.get(r.file)![method]!;
          const permission = handler.permission as Permission;
          for (const role of ROLES) {
            const user = setup.own.members[role];
            const cookie = await sessionCookie(user.id);
            for (const [ws, other] of [
              [setup.own, false],
              [setup.other, true],
            ] as const) {
              const { values, real } = await paramsFor(r, ws);
              if (!real) ambiguous.add(r.file);
              const res = await call(handler, request(method, fillPattern(r.pattern, values), { cookie }), values);
              calls += 1;
              const f = judge(
                { route: r.file, method, who: role, permission, status: res.status },
                can(role, permission),
                other,
                real,
              );
              if (f) failures.push(f);
            }
          }
        }
      }
      expect(
        [...ambiguous],
        'routes checked with a missing id, whose 404 proves nothing: add a fixture in fixtures.ts',
      ).toEqual([]);
      console.info(`[authz] ${calls} member calls over ${workspaceRoutes.length} workspace route files`);
      expect(failures).toEqual([]);
    },
    MATRIX_TIMEOUT_MS,
  );

  it(
    'API keys: their own role in their own workspace, 404 in any other',
    async () => {
      const failures: Outcome[] = [];
      for (const role of API_KEY_ROLES) {
        const key = await createApiKey(
          { workspaceId: setup.own.id },
          { name: `matrix-${role}`, role, createdBy: setup.own.owner.id, actor: 'matrix' },
        );
        for (const r of workspaceRoutes) {
          for (const method of methodsOf(r)) {
            const handler = modules.get(r.file)![method]!;
            const permission = handler.permission as Permission;
            for (const [ws, other] of [
              [setup.own, false],
              [setup.other, true],
            ] as const) {
              const { values, real } = await paramsFor(r, ws);
              const res = await call(
                handler,
                request(method, fillPattern(r.pattern, values), { bearer: key.key }),
                values,
              );
              // Creating API keys needs a signed-in owner, never a key: 403 is right for every key.
              const allowed = can(role, permission) && !(r.pattern.endsWith('/api-keys') && method === 'POST');
              const f = judge(
                { route: r.file, method, who: `key:${role}`, permission, status: res.status },
                allowed,
                other,
                real,
              );
              if (f) failures.push(f);
            }
          }
        }
      }
      expect(failures).toEqual([]);
    },
    MATRIX_TIMEOUT_MS,
  );

  it(
    'a signed-in stranger and an anonymous caller get 404 and 401 on every workspace route',
    async () => {
      const stranger = await makeUser('stranger');
      const cookie = await sessionCookie(stranger.id);
      const problems: string[] = [];
      for (const r of workspaceRoutes) {
        for (const method of methodsOf(r)) {
          const { values } = await paramsFor(r, setup.own);
          const url = fillPattern(r.pattern, values);
          const s = await call(modules.get(r.file)![method], request(method, url, { cookie }), values);
          if (s.status !== 404) problems.push(`${r.file} ${method} stranger: ${s.status}`);
          const a = await call(modules.get(r.file)![method], request(method, url, {}), values);
          if (a.status !== 401) problems.push(`${r.file} ${method} anonymous: ${a.status}`);
        }
      }
      expect(problems).toEqual([]);
    },
    MATRIX_TIMEOUT_MS,
  );
});
