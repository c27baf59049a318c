import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { makeWorkspace, sessionCookie, TEST_ORIGIN, useTestDatabase } from '../support/test-db';
import {
  fillPattern,
  HTTP_METHODS,
  loadRoute,
  routeFiles,
  type HttpMethod,
  type RouteFile,
  type RouteModule,
} from '../integration/security/discover';
import { FLIGHT, ID_FIXTURES, resourceOf, type Ws } from '../integration/security/fixtures';
import { bodyText, csvText, queryString } from './arbitraries';
import { API_OPERATIONS, type OperationSpec } from '@/lib/api/openapi';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { freePort } from '../support/free-port';

/**
 * Property: whatever arrives at a /api/v1 route (wrong types, huge numbers, NaN and Infinity as text,
 * deep nesting, prototype-pollution keys, unicode, broken JSON, odd CSV), the answer is never a 5xx,
 * an error is always `{ error: { code, message } }`, and a 422 names the offending fields by path
 * (or, for a CSV, the problem lines). FUZZ_RUNS sets the cases per route and method.
 */

const smtpPort = await freePort();
const smtpHttpPort = await freePort();
useTestDatabase({
  RATE_LIMIT_API_PER_MIN: '1000000000',
  RATE_LIMIT_PREVIEW_PER_MIN: '1000000000',
  RATE_LIMIT_EMAIL_PER_HOUR: '1000000000',
  RATE_LIMIT_REPORT_SENDS_PER_HOUR: '1000000000',
  SMTP_PORT: String(smtpPort),
});

// Sized so the suite stays near 20 s inside `npm test` on this 2-core machine.
const TOTAL_DEFAULT_CASES = 6_000;
const DEFAULT_PER_ROUTE = { min: 50, max: 300 };

const SEEDS: Record<string, unknown[]> = {
  '/workspaces': [{ name: 'Fuzz operator' }, { name: 'Fuzz operator', slug: 'fuzz-op' }],
  '/workspaces/{slug}/api-keys': [{ name: 'ci', role: 'viewer' }],
  '/workspaces/{slug}/screenings': [
    { ...FLIGHT, name: 'fuzz' },
    {
      ...FLIGHT,
      cruise: {
        steps: [
          { fromKm: 0, flightLevel: 350 },
          { fromKm: 2000, flightLevel: 390 },
        ],
      },
      tropopause: {
        sounding: [
          { pressureHpa: 300, temperatureK: 229 },
          { pressureHpa: 250, temperatureK: 221 },
          { pressureHpa: 200, temperatureK: 217 },
          { pressureHpa: 150, temperatureK: 216 },
        ],
      },
    },
    {
      ...FLIGHT,
      emission: {
        engine: { fuelFlowKgS: [0.1, 0.3, 0.9, 1.1], eiNoxGPerKg: [5, 11, 23, 30] },
        engineCount: 2,
        method: 'dlr',
      },
      flightDate: '2026-07-01',
      mach: 0.84,
    },
  ],
  '/workspaces/{slug}/screenings/preview': [
    { ...FLIGHT, whatIf: { deltasFt: [-2000, 2000], fuelPenaltyPctPer1000Ft: 1 } },
    FLIGHT,
  ],
  '/tropopause': [
    {
      levels: [
        { altitudeM: 9000, temperatureK: 229 },
        { altitudeM: 10500, temperatureK: 219 },
        { altitudeM: 12000, temperatureK: 217 },
        { altitudeM: 14000, temperatureK: 217 },
      ],
    },
  ],
  '/workspaces/{slug}/fleets': [{ name: 'Long haul', description: 'polar' }],
  '/workspaces/{slug}/fleets/{id}': [{ name: 'Renamed', aircraftTypeIds: [] }],
  '/workspaces/{slug}/routes': [
    { name: 'LHR-JFK', waypoints: [{ airport: 'EGLL' }, { lat: 55, lon: -30 }, { airport: 'KJFK' }], notes: '' },
  ],
  '/workspaces/{slug}/routes/{id}': [{ name: 'Renamed' }, { waypoints: [{ airport: 'EGLL' }, { airport: 'KSFO' }] }],
  '/workspaces/{slug}/engines': [
    { name: 'Demo engine', fuelFlowKgS: [0.1, 0.3, 0.9, 1.1], eiNoxGPerKg: [5, 11, 23, 30], source: 'demo' },
  ],
  '/workspaces/{slug}/aircraft-types': [
    { code: 'FZ-1', name: 'Fuzz', directEiGPerKg: 14, engineCount: 2, typicalMach: 0.8, typicalFlightLevel: 370 },
  ],
  '/workspaces/{slug}/soundings': [
    {
      name: 'Fuzz sounding',
      levels: [
        { altitudeM: 9000, temperatureK: 229 },
        { altitudeM: 10500, temperatureK: 219 },
        { altitudeM: 12000, temperatureK: 217 },
      ],
    },
  ],
  '/workspaces/{slug}/reports': [{ name: 'Quarter', from: '2026-09-01', to: '2026-11-30', fleetIds: [1] }],
  '/workspaces/{slug}/reports/{id}/send': [{ recipients: ['fleet@example.test'], note: 'For review' }],
};

interface Target {
  route: RouteFile;
  method: HttpMethod;
  handler: NonNullable<RouteModule[HttpMethod]>;
  op: OperationSpec | undefined;
  key: string;
}

const targets: Target[] = [];
let ws: Ws;
let cookie = '';
let smtp: SmtpFake;
const figures: { route: string; cases: number; failures: number; seconds: number; statuses: Record<number, number> }[] =
  [];

function openApiKey(pattern: string): string {
  return pattern.replace(/^\/api\/v1/, '').replace(/\[([^\]]+)\]/g, '{$1}');
}

beforeAll(async () => {
  smtp = await startSmtpFake({ smtpPort, httpPort: smtpHttpPort });
  const w = await makeWorkspace();
  ws = w;
  cookie = await sessionCookie(w.owner.id);
  for (const r of routeFiles().filter((x) => x.pattern.startsWith('/api/v1/'))) {
    const mod = await loadRoute(r);
    const key = openApiKey(r.pattern);
    for (const m of HTTP_METHODS) {
      const handler = mod[m];
      if (typeof handler === 'function')
        targets.push({ route: r, method: m, handler, op: API_OPERATIONS[key]?.[m.toLowerCase() as 'get'], key });
    }
  }
});

afterAll(async () => {
  await smtp?.close();
  const total = figures.reduce(
    (a, f) => ({ cases: a.cases + f.cases, failures: a.failures + f.failures, seconds: a.seconds + f.seconds }),
    { cases: 0, failures: 0, seconds: 0 },
  );
  console.info(
    `[fuzz] ${figures.length} route methods, ${total.cases} cases (${runsPerRoute()} per route method), ${total.failures} failures, ${total.seconds.toFixed(1)} s\n` +
      figures
        .map(
          (f) =>
            `  ${f.route.padEnd(58)} ${String(f.cases).padStart(6)} cases ${f.seconds.toFixed(2).padStart(7)} s  ${Object.entries(
              f.statuses,
            )
              .map(([k, v]) => `${k}:${v}`)
              .join(' ')}${f.failures ? ' FAILED' : ''}`,
        )
        .join('\n'),
  );
});

function runsPerRoute(): number {
  const fromEnv = Number(process.env.FUZZ_RUNS);
  if (Number.isFinite(fromEnv) && fromEnv > 0) return Math.floor(fromEnv);
  return Math.min(
    DEFAULT_PER_ROUTE.max,
    Math.max(DEFAULT_PER_ROUTE.min, Math.floor(TOTAL_DEFAULT_CASES / Math.max(1, targets.length))),
  );
}

interface Case {
  query: string;
  body?:
    | { kind: 'json'; text: string; contentType: string }
    | { kind: 'multipart'; csv: string; fields: [string, string][]; fileField: string };
  id?: string;
}

function caseArbitrary(t: Target): fc.Arbitrary<Case> {
  const queryKeys = Object.keys(t.op?.query ?? {});
  const query = queryString(queryKeys);
  const hasId = t.route.params.some((p) => p !== 'slug');
  // Mostly a real row of the workspace (so the body is what gets fuzzed), sometimes a hostile id.
  const hostileId = fc.oneof(
    fc.constantFrom('0', '-1', '1e3', '9'.repeat(20), '2147483648', '999999999999', '%00', 'NaN', '１', '1.5', '00001'),
    fc.string({ maxLength: 12 }),
  );
  const id = hasId
    ? fc.oneof({ arbitrary: fc.constant(null), weight: 4 }, { arbitrary: hostileId, weight: 1 })
    : fc.constant(null);
  const multipart = t.op?.requestBody && 'multipart' in t.op.requestBody ? t.op.requestBody.multipart : undefined;
  if (t.method === 'GET' || t.method === 'DELETE')
    return fc.record({ query, id }).map(({ query: q, id: i }) => ({ query: q, id: i ?? undefined }));
  const contentType = fc.constantFrom(
    'application/json',
    'application/json; charset=utf-8',
    'text/plain',
    'application/x-www-form-urlencoded',
  );
  const json = fc
    .record({ text: bodyText(SEEDS[t.key] ?? []), contentType })
    .map((b) => ({ kind: 'json' as const, ...b }));
  const fieldNames = Object.keys(multipart ?? { file: '' }).filter((f) => f !== 'file');
  const form = fc
    .record({
      csv: csvText,
      fields: fc.array(
        fc.tuple(
          fc.constantFrom(...(fieldNames.length ? fieldNames : ['name']), 'other'),
          fc.string({ maxLength: 30 }),
        ),
        { maxLength: 4 },
      ),
      fileField: fc.constantFrom('file', 'file', 'file', 'upload'),
    })
    .map((m) => ({ kind: 'multipart' as const, ...m }));
  const body = multipart ? fc.oneof({ arbitrary: form, weight: 4 }, { arbitrary: json, weight: 1 }) : json;
  return fc
    .record({ query, body, id })
    .map(({ query: q, body: b, id: i }) => ({ query: q, body: b, id: i ?? undefined }));
}

const fixtureCache = new Map<string, string>();

/** A DELETE gets a fresh row each case; other methods reuse one row per route. */
async function paramsFor(t: Target, fuzzedId: string | undefined): Promise<Record<string, string>> {
  const values: Record<string, string> = { slug: ws.slug };
  for (const p of t.route.params) {
    if (p === 'slug') continue;
    if (fuzzedId !== undefined) {
      values[p] = fuzzedId;
      continue;
    }
    const cacheKey = `${t.route.file}#${p}`;
    const cached = t.method === 'DELETE' ? undefined : fixtureCache.get(cacheKey);
    if (cached) {
      values[p] = cached;
      continue;
    }
    const make = ID_FIXTURES[resourceOf(t.route.pattern, p) ?? ''];
    values[p] = make ? String(await make(ws)) : '1';
    if (t.method !== 'DELETE') fixtureCache.set(cacheKey, values[p]);
  }
  return values;
}

function buildRequest(t: Target, c: Case, params: Record<string, string>): Request {
  const url = new URL(fillPattern(t.route.pattern, params), TEST_ORIGIN);
  url.search = c.query;
  const headers = new Headers({ cookie, host: new URL(TEST_ORIGIN).host, origin: TEST_ORIGIN });
  let body: BodyInit | undefined;
  if (c.body?.kind === 'json') {
    headers.set('content-type', c.body.contentType);
    body = c.body.text;
  } else if (c.body?.kind === 'multipart') {
    const fd = new FormData();
    fd.set(c.body.fileField, new Blob([c.body.csv], { type: 'text/csv' }), 'fuzz.csv');
    for (const [k, v] of c.body.fields) fd.append(k, v);
    body = fd;
  }
  return new Request(url, { method: t.method, headers, body });
}

/** What is wrong with a response, or null when it keeps the contract. */
async function violation(t: Target, res: Response): Promise<string | null> {
  const documented = Object.keys(t.op?.responses ?? {});
  if (res.status >= 500 && !(res.status === 503 && documented.includes('503')))
    return `status ${res.status}: ${(await res.text()).slice(0, 300)}`;
  if (res.status < 400) {
    await res.arrayBuffer();
    return null;
  }
  const text = await res.text();
  let parsed: { error?: { code?: unknown; message?: unknown; fields?: { path?: unknown }[] }; problems?: unknown[] };
  try {
    parsed = JSON.parse(text) as typeof parsed;
  } catch {
    return `status ${res.status} without a JSON body: ${text.slice(0, 200)}`;
  }
  const e = parsed.error;
  if (!e || typeof e.code !== 'string' || typeof e.message !== 'string' || !e.message)
    return `status ${res.status} without { error: { code, message } }: ${text.slice(0, 200)}`;
  if (res.status === 422) {
    const fieldsOk =
      Array.isArray(e.fields) &&
      e.fields.length > 0 &&
      e.fields.every((f) => typeof f.path === 'string' && f.path.length > 0);
    const problemsOk = Array.isArray(parsed.problems) && parsed.problems.length > 0;
    if (!fieldsOk && !problemsOk) return `422 that names no field: ${text.slice(0, 200)}`;
  }
  if (res.status === 429 && !res.headers.get('retry-after')) return '429 without Retry-After';
  return null;
}

const polluted = () =>
  Object.keys(Object.prototype).length > 0 ||
  ({} as Record<string, unknown>).polluted !== undefined ||
  ({} as Record<string, unknown>).isAdmin !== undefined;

describe('fuzzing every /api/v1 route', () => {
  it('finds the routes', () => {
    expect(targets.length).toBeGreaterThanOrEqual(10);
  });

  it('never a 5xx, always a JSON error naming a field', { timeout: 3_600_000 }, async () => {
    const failures: string[] = [];
    for (const t of targets) {
      const started = Date.now();
      let cases = 0;
      let failed = 0;
      const statuses: Record<number, number> = {};
      const runs = runsPerRoute();
      const seed = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;
      const outcome = await fc.check(
        fc.asyncProperty(caseArbitrary(t), async (c) => {
          cases += 1;
          const params = await paramsFor(t, c.id);
          const res = await t.handler(buildRequest(t, c, params), { params: Promise.resolve(params) });
          statuses[res.status] = (statuses[res.status] ?? 0) + 1;
          const v = await violation(t, res);
          if (polluted()) throw new Error('Object.prototype was polluted');
          if (v) throw new Error(v);
        }),
        { numRuns: runs, seed, endOnFailure: runs > 1000 },
      );
      if (outcome.failed) {
        failed = 1;
        const c = outcome.counterexample?.[0] as Case | undefined;
        const shown = c
          ? JSON.stringify({
              query: c.query,
              id: c.id,
              body: c.body
                ? {
                    ...c.body,
                    ...('text' in c.body ? { text: c.body.text.slice(0, 400) } : { csv: c.body.csv.slice(0, 400) }),
                  }
                : undefined,
            })
          : '';
        failures.push(
          `${t.method} ${t.route.pattern} (seed ${outcome.seed}, path ${outcome.counterexamplePath}): ${outcome.errorInstance instanceof Error ? outcome.errorInstance.message : String(outcome.errorInstance)}\n    case: ${shown}`,
        );
      }
      figures.push({
        route: `${t.method} ${t.route.pattern.replace('/api/v1', '')}`,
        cases,
        failures: failed,
        seconds: (Date.now() - started) / 1000,
        statuses,
      });
    }
    expect(failures).toEqual([]);
  });
});
